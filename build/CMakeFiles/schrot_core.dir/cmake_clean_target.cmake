file(REMOVE_RECURSE
  "libschrot_core.a"
)
