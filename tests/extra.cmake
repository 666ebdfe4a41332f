
# ---- cli: begin (owned by the command-line program; see docs/cli.md) ----
# tests/cli/test_cli.cpp runs the `spinwright` executable; it needs the program built first
# and its path. Without SPINWRIGHT_BUILD_CLI the program does not exist, and the test is disabled.
if(TARGET cli_test_cli)
  if(SPINWRIGHT_BUILD_CLI AND NOT CMAKE_SYSTEM_NAME STREQUAL "Generic")
    # spinwright-cli is defined later (examples/cli); both commands resolve at generate time.
    add_dependencies(cli_test_cli spinwright-cli)
    target_compile_definitions(cli_test_cli PRIVATE SPINWRIGHT_CLI_PATH="$<TARGET_FILE:spinwright-cli>")
    set_tests_properties(cli.test_cli PROPERTIES TIMEOUT 300)
  else()
    set_tests_properties(cli.test_cli PROPERTIES DISABLED TRUE)
  endif()
endif()
# ---- cli: end ----

# ---- kernels (tempering / tabu / exact): begin ----
# GLPK (GNU Linear Programming Kit) is a test-only dependency of kernels_test_glpk_reference:
# exact enumeration is checked against its MILP optimum. Debian: apt-get install libglpk-dev.
if(TARGET kernels_test_glpk_reference)
  find_library(SPINWRIGHT_GLPK_LIBRARY NAMES glpk)
  find_path(SPINWRIGHT_GLPK_INCLUDE_DIR NAMES glpk.h)
  if(NOT SPINWRIGHT_GLPK_LIBRARY OR NOT SPINWRIGHT_GLPK_INCLUDE_DIR)
    message(FATAL_ERROR
      "GLPK not found (needed by tests/kernels/test_glpk_reference.cpp): install libglpk-dev "
      "(apt-get install libglpk-dev) or set SPINWRIGHT_GLPK_LIBRARY and SPINWRIGHT_GLPK_INCLUDE_DIR.")
  endif()
  target_include_directories(kernels_test_glpk_reference SYSTEM PRIVATE ${SPINWRIGHT_GLPK_INCLUDE_DIR})
  target_link_libraries(kernels_test_glpk_reference PRIVATE ${SPINWRIGHT_GLPK_LIBRARY})
endif()
# ---- kernels (tempering / tabu / exact): end ----

# ---- mpi: begin ----
# Restarts over MPI ranks, run under mpirun (tests/mpi/). Off by default so the core's tests
# need no MPI; the test preset turns it on and scripts/test.sh installs Open MPI.
option(SPINWRIGHT_TEST_MPI "Build and run the MPI tests (needs an MPI library and mpirun)" OFF)
if(SPINWRIGHT_TEST_MPI)
  add_subdirectory(${CMAKE_CURRENT_SOURCE_DIR}/mpi ${CMAKE_CURRENT_BINARY_DIR}/mpi)
endif()
# ---- mpi: end ----

# ---- kernels (quantum annealing): begin ----
# Eigen is a test-only dependency of kernels_test_quantum_anneal: small transverse-field models
# are checked against exact diagonalisation. Debian: apt-get install libeigen3-dev.
if(TARGET kernels_test_quantum_anneal)
  find_package(Eigen3 3.3 NO_MODULE QUIET)
  if(NOT TARGET Eigen3::Eigen)
    message(FATAL_ERROR
      "Eigen not found (needed by tests/kernels/test_quantum_anneal.cpp): install libeigen3-dev "
      "(apt-get install libeigen3-dev) or set Eigen3_DIR.")
  endif()
  get_target_property(SPINWRIGHT_EIGEN_INCLUDE Eigen3::Eigen INTERFACE_INCLUDE_DIRECTORIES)
  target_include_directories(kernels_test_quantum_anneal SYSTEM PRIVATE ${SPINWRIGHT_EIGEN_INCLUDE})
endif()
# ---- kernels (quantum annealing): end ----
