# cmake -P driver: configure and build the on-target project for one CPU.
# Inputs: SOURCE_DIR, BINARY_DIR, CPU, TOOLCHAIN, GENERATOR.
execute_process(
  COMMAND "${CMAKE_COMMAND}" -S "${SOURCE_DIR}" -B "${BINARY_DIR}" -G "${GENERATOR}"
          "--toolchain" "${TOOLCHAIN}" "-DHALFSPIN_TARGET_CPU=${CPU}" -DCMAKE_BUILD_TYPE=Release
  RESULT_VARIABLE configure_result)
if(NOT configure_result EQUAL 0)
  message(FATAL_ERROR "configuring the ${CPU} target build failed")
endif()
execute_process(COMMAND "${CMAKE_COMMAND}" --build "${BINARY_DIR}" -j 2 RESULT_VARIABLE build_result)
if(NOT build_result EQUAL 0)
  message(FATAL_ERROR "building the ${CPU} target images failed")
endif()
