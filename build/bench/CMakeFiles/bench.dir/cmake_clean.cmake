file(REMOVE_RECURSE
  "CMakeFiles/bench"
)

# Per-language clean rules from dependency scanning.
foreach(lang )
  include(CMakeFiles/bench.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
