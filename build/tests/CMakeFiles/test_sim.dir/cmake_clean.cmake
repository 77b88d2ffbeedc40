file(REMOVE_RECURSE
  "CMakeFiles/test_sim.dir/unit/test_sim.c.o"
  "CMakeFiles/test_sim.dir/unit/test_sim.c.o.d"
  "test_sim"
  "test_sim.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_sim.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
