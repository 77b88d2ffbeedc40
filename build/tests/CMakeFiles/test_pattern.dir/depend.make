# Empty dependencies file for test_pattern.
# This may be replaced when dependencies are built.
