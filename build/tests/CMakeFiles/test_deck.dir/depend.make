# Empty dependencies file for test_deck.
# This may be replaced when dependencies are built.
