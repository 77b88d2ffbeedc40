# Empty dependencies file for test_physics.
# This may be replaced when dependencies are built.
