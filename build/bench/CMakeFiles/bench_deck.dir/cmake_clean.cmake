file(REMOVE_RECURSE
  "CMakeFiles/bench_deck.dir/bench_deck.c.o"
  "CMakeFiles/bench_deck.dir/bench_deck.c.o.d"
  "bench_deck"
  "bench_deck.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/bench_deck.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
