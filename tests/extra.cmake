
# ---- cli: begin (owned by the command-line program; see docs/cli.md) ----
# tests/cli/test_cli.cpp runs the `spinwright` executable; it needs the program built first
# and its path. Without the examples the program does not exist, and the test is disabled.
if(TARGET cli_test_cli)
  if(SPINWRIGHT_BUILD_EXAMPLES)
    # spinwright-cli is defined later (examples/cli); both commands resolve at generate time.
    add_dependencies(cli_test_cli spinwright-cli)
    target_compile_definitions(cli_test_cli PRIVATE SPINWRIGHT_CLI_PATH="$<TARGET_FILE:spinwright-cli>")
    set_tests_properties(cli.test_cli PROPERTIES TIMEOUT 300)
  else()
    set_tests_properties(cli.test_cli PROPERTIES DISABLED TRUE)
  endif()
endif()
# ---- cli: end ----
