# Runs the Cortex-M4 build under qemu-system-arm (MPS2-AN386 board, semihosting output),
# builds and runs the host build of the same source, and fails unless both print exactly the
# same text and both exit 0. Also reports the firmware's code and RAM size.
foreach(var ELF QEMU SIZE HOST_CXX SOURCE_DIR INCLUDE_DIR WORK_DIR)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "missing -D${var}=")
  endif()
endforeach()
file(MAKE_DIRECTORY ${WORK_DIR})

execute_process(COMMAND ${SIZE} ${ELF} OUTPUT_VARIABLE size_report)
message(STATUS "firmware size (text = code + constants in flash; data + bss = static RAM):\n${size_report}")

# Semihosting output goes to a file through a character device (qemu would otherwise mix it
# into its own stderr).
file(REMOVE ${WORK_DIR}/target_output.txt)
execute_process(
  COMMAND ${QEMU} -M mps2-an386 -nographic -monitor none -serial none
          -chardev file,id=semihosting,path=${WORK_DIR}/target_output.txt
          -semihosting-config enable=on,target=native,chardev=semihosting -kernel ${ELF}
  RESULT_VARIABLE target_rc OUTPUT_VARIABLE target_log ERROR_VARIABLE target_err TIMEOUT 120)
set(target_out "")
if(EXISTS ${WORK_DIR}/target_output.txt)
  file(READ ${WORK_DIR}/target_output.txt target_out)
endif()
message(STATUS "cortex-m4 (qemu) exit ${target_rc}: ${target_out}")
if(NOT target_rc EQUAL 0)
  message(FATAL_ERROR "the emulated firmware failed (${target_rc}): ${target_out}${target_err}")
endif()

execute_process(
  COMMAND ${HOST_CXX} -std=c++17 -O2 -fno-exceptions -fno-rtti -DSPINWRIGHT_NO_HEAP=1 -DSPINWRIGHT_ASSERTS=0
          -I${INCLUDE_DIR} -I${SOURCE_DIR} ${SOURCE_DIR}/firmware_main.cpp ${SOURCE_DIR}/platform_host.cpp
          -o ${WORK_DIR}/firmware_host
  RESULT_VARIABLE build_rc ERROR_VARIABLE build_err)
if(NOT build_rc EQUAL 0)
  message(FATAL_ERROR "host build failed: ${build_err}")
endif()
execute_process(COMMAND ${WORK_DIR}/firmware_host RESULT_VARIABLE host_rc OUTPUT_VARIABLE host_out TIMEOUT 60)
message(STATUS "host exit ${host_rc}: ${host_out}")
if(NOT host_rc EQUAL 0)
  message(FATAL_ERROR "the host build failed (${host_rc})")
endif()
if(NOT target_out STREQUAL host_out)
  message(FATAL_ERROR "answers differ:\n  cortex-m4: ${target_out}\n  host:      ${host_out}")
endif()
message(STATUS "cortex-m4 and host answers are identical")
