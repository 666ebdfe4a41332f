# Run with cmake -P: installs the project (library and command-line program) into a temporary
# prefix and checks the install tree (headers, CMake package, pkg-config file, the program);
# then builds and runs a consumer each way README.md shows: find_package, add_subdirectory,
# FetchContent with GIT_TAG (when SOURCE_DIR is a git checkout; its committed HEAD), a program
# compiled with the pkg-config flags, and a parent project that exports its own target
# linking spinwright (tests/package/exporter) used through find_package.
foreach(var SOURCE_DIR WORK_DIR CXX)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "missing -D${var}=")
  endif()
endforeach()
file(REMOVE_RECURSE ${WORK_DIR})
function(run)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "failed (${rc}): ${ARGN}\n${out}\n${err}")
  endif()
  set(run_output "${out}" PARENT_SCOPE)
endfunction()
set(prefix ${WORK_DIR}/prefix)
# A plain user configure of the source tree: the library and the CLI, no tests, no examples.
run(${CMAKE_COMMAND} -S ${SOURCE_DIR} -B ${WORK_DIR}/lib -DCMAKE_CXX_COMPILER=${CXX}
    -DSPINWRIGHT_BUILD_TESTS=OFF -DSPINWRIGHT_BUILD_EXAMPLES=OFF -DSPINWRIGHT_BUILD_CLI=ON -DSPINWRIGHT_BUILD_MPI_CLI=OFF
    -DCMAKE_INSTALL_PREFIX=${prefix})
run(${CMAKE_COMMAND} --build ${WORK_DIR}/lib -j 2)
run(${CMAKE_COMMAND} --install ${WORK_DIR}/lib)

# The install tree.
foreach(f include/spinwright/spinwright.hpp share/cmake/spinwright/spinwrightConfig.cmake
          share/pkgconfig/spinwright.pc bin/spinwright)
  if(NOT EXISTS ${prefix}/${f})
    message(FATAL_ERROR "the install tree has no ${f}")
  endif()
endforeach()
run(${prefix}/bin/spinwright --version)
if(NOT run_output MATCHES "spinwright")
  message(FATAL_ERROR "installed spinwright --version printed: ${run_output}")
endif()
message(STATUS "install tree: headers, CMake package, pkg-config file, bin/spinwright: ok")

# pkg-config: the flags it gives compile the consumer (read from the .pc file without pkg-config).
find_program(PKG_CONFIG_EXECUTABLE NAMES pkg-config pkgconf)
if(PKG_CONFIG_EXECUTABLE)
  set(ENV{PKG_CONFIG_PATH} ${prefix}/share/pkgconfig)
  run(${PKG_CONFIG_EXECUTABLE} --cflags spinwright)
  string(STRIP "${run_output}" cflags)
  run(${PKG_CONFIG_EXECUTABLE} --libs spinwright)
  string(STRIP "${run_output}" libs)
else()
  file(READ ${prefix}/share/pkgconfig/spinwright.pc pc)
  string(REGEX MATCH "includedir=([^\n]*)" _ "${pc}")
  string(REPLACE "\${prefix}" "${prefix}" inc "${CMAKE_MATCH_1}")
  set(cflags "-I${inc}")
  set(libs "-pthread")
endif()
if(NOT cflags MATCHES "-I${prefix}/include")
  message(FATAL_ERROR "pkg-config --cflags spinwright gave '${cflags}', not -I${prefix}/include")
endif()
separate_arguments(cflags UNIX_COMMAND "${cflags}")
separate_arguments(libs UNIX_COMMAND "${libs}")
run(${CXX} -std=c++17 ${cflags} ${SOURCE_DIR}/tests/package/consumer/main.cpp -o ${WORK_DIR}/pc_consumer ${libs})
run(${WORK_DIR}/pc_consumer)
message(STATUS "consumer through pkg-config: ok")

set(modes find_package add_subdirectory)
execute_process(COMMAND git -C ${SOURCE_DIR} rev-parse HEAD RESULT_VARIABLE git_rc OUTPUT_VARIABLE git_head
                ERROR_QUIET OUTPUT_STRIP_TRAILING_WHITESPACE)
if(git_rc EQUAL 0)
  list(APPEND modes fetchcontent)
else()
  message(STATUS "consumer through FetchContent: skipped (${SOURCE_DIR} is not a git checkout)")
endif()

# The parent project that exports its own target, installed into the same prefix.
run(${CMAKE_COMMAND} -S ${SOURCE_DIR}/tests/package/exporter -B ${WORK_DIR}/exporter -DCMAKE_CXX_COMPILER=${CXX}
    -DSPINWRIGHT_SOURCE_DIR=${SOURCE_DIR} -DCMAKE_INSTALL_PREFIX=${WORK_DIR}/planner_prefix)
run(${CMAKE_COMMAND} --build ${WORK_DIR}/exporter)
run(${CMAKE_COMMAND} --install ${WORK_DIR}/exporter)
list(APPEND modes planner)

foreach(mode IN LISTS modes)
  set(search ${prefix})
  if(mode STREQUAL "planner")
    set(search ${WORK_DIR}/planner_prefix)  # planner and the spinwright it installed, nothing else
  endif()
  run(${CMAKE_COMMAND} -S ${SOURCE_DIR}/tests/package/consumer -B ${WORK_DIR}/${mode} -DCMAKE_CXX_COMPILER=${CXX}
      -DSPINWRIGHT_CONSUME=${mode} -DSPINWRIGHT_SOURCE_DIR=${SOURCE_DIR} -DSPINWRIGHT_GIT_TAG=${git_head}
      -DCMAKE_PREFIX_PATH=${search})
  run(${CMAKE_COMMAND} --build ${WORK_DIR}/${mode})
  run(${WORK_DIR}/${mode}/consumer)
  message(STATUS "consumer through ${mode}: ok")
endforeach()
