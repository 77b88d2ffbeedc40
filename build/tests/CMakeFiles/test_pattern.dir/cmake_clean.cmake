file(REMOVE_RECURSE
  "CMakeFiles/test_pattern.dir/unit/test_pattern.c.o"
  "CMakeFiles/test_pattern.dir/unit/test_pattern.c.o.d"
  "test_pattern"
  "test_pattern.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_pattern.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
