
# Consider dependencies only in project.
set(CMAKE_DEPENDS_IN_PROJECT_ONLY OFF)

# The set of languages for which implicit dependencies are needed:
set(CMAKE_DEPENDS_LANGUAGES
  )

# The set of dependency files which are needed:
set(CMAKE_DEPENDS_DEPENDENCY_FILES
  "/work/main/tests/fuzz/fuzz_cli.c" "tests/CMakeFiles/replay_fuzz_cli.dir/fuzz/fuzz_cli.c.o" "gcc" "tests/CMakeFiles/replay_fuzz_cli.dir/fuzz/fuzz_cli.c.o.d"
  "/work/main/tests/fuzz/replay.c" "tests/CMakeFiles/replay_fuzz_cli.dir/fuzz/replay.c.o" "gcc" "tests/CMakeFiles/replay_fuzz_cli.dir/fuzz/replay.c.o.d"
  )

# Targets to which this target links.
set(CMAKE_TARGET_LINKED_INFO_FILES
  "/work/main/build/CMakeFiles/schrot_core.dir/DependInfo.cmake"
  )

# Fortran module output directory.
set(CMAKE_Fortran_TARGET_MODULE_DIR "")
