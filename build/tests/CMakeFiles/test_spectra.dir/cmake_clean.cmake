file(REMOVE_RECURSE
  "CMakeFiles/test_spectra.dir/unit/test_spectra.c.o"
  "CMakeFiles/test_spectra.dir/unit/test_spectra.c.o.d"
  "test_spectra"
  "test_spectra.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_spectra.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
