# Empty dependencies file for test_rng.
# This may be replaced when dependencies are built.
