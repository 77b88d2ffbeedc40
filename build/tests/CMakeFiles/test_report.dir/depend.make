# Empty dependencies file for test_report.
# This may be replaced when dependencies are built.
