# cmake -P script: runs every footprint image of the manifest under qemu and requires exit
# status 0 (the image propagated its whole input without a rejected sample and left through the
# semihosting exit). Proves the images measured for footprint and cycles are working programs.
# Inputs: BINARY_DIR (target build dir), QEMU (qemu-system-arm), MACHINE (mps2-an386/an385).
cmake_minimum_required(VERSION 3.25)
set(manifest "${BINARY_DIR}/footprint/manifest.txt")
if(NOT EXISTS "${manifest}")
  message(FATAL_ERROR "no footprint manifest ${manifest}")
endif()
file(STRINGS "${manifest}" lines)
set(failures "")
set(count 0)
foreach(line IN LISTS lines)
  string(REGEX MATCH "^[^ ]+" image "${line}")
  execute_process(
    COMMAND "${QEMU}" -M "${MACHINE}" -nographic -monitor none
            -semihosting-config enable=on,target=native
            -kernel "${BINARY_DIR}/footprint/${image}.elf"
    RESULT_VARIABLE result OUTPUT_VARIABLE out ERROR_VARIABLE err TIMEOUT 60)
  if(NOT result STREQUAL "0")
    list(APPEND failures "${image}: exit ${result} ${err}")
  endif()
  math(EXPR count "${count} + 1")
endforeach()
if(count EQUAL 0)
  message(FATAL_ERROR "the manifest lists no images")
endif()
if(failures)
  list(JOIN failures "\n  " text)
  message(FATAL_ERROR "footprint images failed:\n  ${text}")
endif()
message("${count} footprint images ran and exited 0")
