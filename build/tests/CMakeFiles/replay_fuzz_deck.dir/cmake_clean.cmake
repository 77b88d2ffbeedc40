file(REMOVE_RECURSE
  "CMakeFiles/replay_fuzz_deck.dir/fuzz/fuzz_deck.c.o"
  "CMakeFiles/replay_fuzz_deck.dir/fuzz/fuzz_deck.c.o.d"
  "CMakeFiles/replay_fuzz_deck.dir/fuzz/replay.c.o"
  "CMakeFiles/replay_fuzz_deck.dir/fuzz/replay.c.o.d"
  "replay_fuzz_deck"
  "replay_fuzz_deck.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/replay_fuzz_deck.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
