# The C interface test on the host (label consumer): the standalone project beside this file built
# with gcc and with clang (both required: scripts/test.sh installs them) and run. The Cortex-M4F and
# Cortex-M3 runs are in tests/target (target.<cpu>.c_interface).
find_program(HALFSPIN_GCC gcc)
find_program(HALFSPIN_GXX g++)
find_program(HALFSPIN_CLANG clang)
find_program(HALFSPIN_CLANGXX clang++)
if(NOT HALFSPIN_GCC OR NOT HALFSPIN_GXX OR NOT HALFSPIN_CLANG OR NOT HALFSPIN_CLANGXX)
  message(FATAL_ERROR "The C interface's test is built with gcc and with clang; install both "
                      "(Debian: gcc g++ clang; bash scripts/test.sh does) or configure with "
                      "-DHALFSPIN_BUILD_TESTS=OFF.")
endif()
set(_halfspin_c_pairs "gcc|${HALFSPIN_GCC}|${HALFSPIN_GXX}" "clang|${HALFSPIN_CLANG}|${HALFSPIN_CLANGXX}")
foreach(pair IN LISTS _halfspin_c_pairs)
  string(REPLACE "|" ";" pair "${pair}")
  list(GET pair 0 name)
  list(GET pair 1 c_compiler)
  list(GET pair 2 cxx_compiler)
  add_test(NAME c_interface.${name}
    COMMAND "${CMAKE_COMMAND}" "-DSOURCE_DIR=${CMAKE_CURRENT_LIST_DIR}"
            "-DBINARY_DIR=${CMAKE_CURRENT_BINARY_DIR}/c_interface-${name}"
            "-DC_COMPILER=${c_compiler}" "-DCXX_COMPILER=${cxx_compiler}"
            "-DGENERATOR=${CMAKE_GENERATOR}"
            -P "${CMAKE_CURRENT_LIST_DIR}/run_sub_build.cmake")
  set_tests_properties(c_interface.${name} PROPERTIES
    LABELS consumer TIMEOUT 900)
endforeach()
