# Empty dependencies file for test_outfile.
# This may be replaced when dependencies are built.
