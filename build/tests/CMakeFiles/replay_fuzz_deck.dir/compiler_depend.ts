# CMAKE generated file: DO NOT EDIT!
# Timestamp file for compiler generated dependencies management for replay_fuzz_deck.
