file(REMOVE_RECURSE
  "CMakeFiles/test_rng.dir/unit/test_rng.c.o"
  "CMakeFiles/test_rng.dir/unit/test_rng.c.o.d"
  "test_rng"
  "test_rng.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_rng.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
