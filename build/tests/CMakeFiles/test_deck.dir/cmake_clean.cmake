file(REMOVE_RECURSE
  "CMakeFiles/test_deck.dir/unit/test_deck.c.o"
  "CMakeFiles/test_deck.dir/unit/test_deck.c.o.d"
  "test_deck"
  "test_deck.pdb"
)

# Per-language clean rules from dependency scanning.
foreach(lang C)
  include(CMakeFiles/test_deck.dir/cmake_clean_${lang}.cmake OPTIONAL)
endforeach()
