# Empty dependencies file for schrot.
# This may be replaced when dependencies are built.
