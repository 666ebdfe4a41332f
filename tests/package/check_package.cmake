# Run with cmake -P: installs the project into a temporary prefix, then builds and runs a
# consumer through find_package(spinwright CONFIG) and another through add_subdirectory.
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
endfunction()
run(${CMAKE_COMMAND} -S ${SOURCE_DIR} -B ${WORK_DIR}/lib -DCMAKE_CXX_COMPILER=${CXX}
    -DSPINWRIGHT_BUILD_TESTS=OFF -DSPINWRIGHT_BUILD_EXAMPLES=OFF -DCMAKE_INSTALL_PREFIX=${WORK_DIR}/prefix)
run(${CMAKE_COMMAND} --install ${WORK_DIR}/lib)
foreach(mode find_package add_subdirectory)
  run(${CMAKE_COMMAND} -S ${SOURCE_DIR}/tests/package/consumer -B ${WORK_DIR}/${mode} -DCMAKE_CXX_COMPILER=${CXX}
      -DSPINWRIGHT_CONSUME=${mode} -DSPINWRIGHT_SOURCE_DIR=${SOURCE_DIR} -DCMAKE_PREFIX_PATH=${WORK_DIR}/prefix)
  run(${CMAKE_COMMAND} --build ${WORK_DIR}/${mode})
  run(${WORK_DIR}/${mode}/consumer)
  message(STATUS "consumer through ${mode}: ok")
endforeach()
