# Empty dependencies file for test_sim.
# This may be replaced when dependencies are built.
