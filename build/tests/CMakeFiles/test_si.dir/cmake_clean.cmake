file(REMOVE_RECURSE
  "CMakeFiles/test_si.dir/unit/test_si.c.o"
  "CMakeFiles/test_si.dir/unit/test_si.c.o.d"
  "test_si"
  "test_si.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_si.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
