# Empty dependencies file for bench_deck.
# This may be replaced when dependencies are built.
