# Empty compiler generated dependencies file for schrot_core.
# This may be replaced when dependencies are built.
