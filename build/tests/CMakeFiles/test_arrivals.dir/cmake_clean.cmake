file(REMOVE_RECURSE
  "CMakeFiles/test_arrivals.dir/unit/test_arrivals.c.o"
  "CMakeFiles/test_arrivals.dir/unit/test_arrivals.c.o.d"
  "test_arrivals"
  "test_arrivals.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_arrivals.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
