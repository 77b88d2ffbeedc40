# Empty dependencies file for test_arrivals.
# This may be replaced when dependencies are built.
