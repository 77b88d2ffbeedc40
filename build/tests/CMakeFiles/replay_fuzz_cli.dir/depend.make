# Empty dependencies file for replay_fuzz_cli.
# This may be replaced when dependencies are built.
