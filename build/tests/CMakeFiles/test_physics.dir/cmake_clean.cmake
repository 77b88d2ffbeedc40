file(REMOVE_RECURSE
  "CMakeFiles/test_physics.dir/unit/test_physics.c.o"
  "CMakeFiles/test_physics.dir/unit/test_physics.c.o.d"
  "test_physics"
  "test_physics.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_physics.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
