file(REMOVE_RECURSE
  "CMakeFiles/test_outfile.dir/unit/test_outfile.c.o"
  "CMakeFiles/test_outfile.dir/unit/test_outfile.c.o.d"
  "test_outfile"
  "test_outfile.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_outfile.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
