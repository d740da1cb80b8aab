# cmake -P driver of one host build of the C interface test: configure this folder's project with
# the given compilers, build it, run both test programs
# (the full interface and a build-time selection) and c/README.md's example.
# Inputs: SOURCE_DIR, BINARY_DIR, C_COMPILER, CXX_COMPILER, GENERATOR.
foreach(var SOURCE_DIR BINARY_DIR C_COMPILER CXX_COMPILER GENERATOR)
  if(NOT DEFINED ${var} OR "${${var}}" STREQUAL "")
    message(FATAL_ERROR "run_sub_build: pass -D${var}=...")
  endif()
endforeach()
file(REMOVE_RECURSE "${BINARY_DIR}")
execute_process(
  COMMAND "${CMAKE_COMMAND}" -S "${SOURCE_DIR}" -B "${BINARY_DIR}" -G "${GENERATOR}"
          "-DCMAKE_C_COMPILER=${C_COMPILER}" "-DCMAKE_CXX_COMPILER=${CXX_COMPILER}"
          -DCMAKE_BUILD_TYPE=Release
  RESULT_VARIABLE status)
if(NOT status EQUAL 0)
  message(FATAL_ERROR "configuring the C interface test with ${C_COMPILER} failed")
endif()
execute_process(COMMAND "${CMAKE_COMMAND}" --build "${BINARY_DIR}" -j 2 RESULT_VARIABLE status)
if(NOT status EQUAL 0)
  message(FATAL_ERROR "building the C interface test with ${C_COMPILER} failed")
endif()
foreach(program halfspin_c_interface_test halfspin_c_interface_test_selected)
  execute_process(COMMAND "${BINARY_DIR}/${program}" RESULT_VARIABLE status
                  OUTPUT_VARIABLE out ERROR_VARIABLE out)
  message("${out}")
  if(NOT status EQUAL 0 OR NOT out MATCHES "c_interface: [1-9][0-9]* passed, 0 failed")
    message(FATAL_ERROR "${program} built with ${C_COMPILER} failed")
  endif()
endforeach()
execute_process(COMMAND "${BINARY_DIR}/halfspin_c_readme_example" RESULT_VARIABLE status
                OUTPUT_VARIABLE out ERROR_VARIABLE out)
message("${out}")
if(NOT status EQUAL 0 OR NOT out STREQUAL "yaw 0.0000 pitch 0.0000 roll 1.0000 rad\n")
  message(FATAL_ERROR "c/README.md's example, built with ${C_COMPILER}, did not print what the "
                      "README says")
endif()
