file(REMOVE_RECURSE
  "CMakeFiles/test_report.dir/unit/test_report.c.o"
  "CMakeFiles/test_report.dir/unit/test_report.c.o.d"
  "test_report"
  "test_report.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_report.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
