# Empty dependencies file for test_spectra.
# This may be replaced when dependencies are built.
