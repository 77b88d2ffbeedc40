# Empty dependencies file for replay_fuzz_deck.
# This may be replaced when dependencies are built.
