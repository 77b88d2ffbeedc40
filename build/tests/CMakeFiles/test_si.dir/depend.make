# Empty dependencies file for test_si.
# This may be replaced when dependencies are built.
