file(REMOVE_RECURSE
  "CMakeFiles/schrot.dir/src/main.c.o"
  "CMakeFiles/schrot.dir/src/main.c.o.d"
  "schrot"
  "schrot.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/schrot.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
