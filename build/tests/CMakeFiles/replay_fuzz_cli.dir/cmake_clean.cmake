file(REMOVE_RECURSE
  "CMakeFiles/replay_fuzz_cli.dir/fuzz/fuzz_cli.c.o"
  "CMakeFiles/replay_fuzz_cli.dir/fuzz/fuzz_cli.c.o.d"
  "CMakeFiles/replay_fuzz_cli.dir/fuzz/replay.c.o"
  "CMakeFiles/replay_fuzz_cli.dir/fuzz/replay.c.o.d"
  "replay_fuzz_cli"
  "replay_fuzz_cli.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/replay_fuzz_cli.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
