# Host-side registration of the on-target tests (ctest label "target"): for each core, one test
# configures and builds tests/target with the cross toolchain, the others run its images under
# qemu-system-arm with semihosting (the program's exit status is qemu's exit code).
find_program(HALFSPIN_ARM_GXX arm-none-eabi-g++)
find_program(HALFSPIN_QEMU_ARM qemu-system-arm)
if(NOT HALFSPIN_ARM_GXX OR NOT HALFSPIN_QEMU_ARM)
  message(FATAL_ERROR
    "The target tests need arm-none-eabi-g++ and qemu-system-arm (Debian: gcc-arm-none-eabi "
    "libnewlib-arm-none-eabi libstdc++-arm-none-eabi-newlib qemu-system-arm); install them or "
    "configure with -DHALFSPIN_TARGET_TESTS=OFF.")
endif()
include("${PROJECT_SOURCE_DIR}/cmake/boards/mps2/mps2.cmake")

set(HALFSPIN_TARGET_CPUS cortex-m4f cortex-m3)
foreach(cpu IN LISTS HALFSPIN_TARGET_CPUS)
  halfspin_mps2_machine(${cpu} machine)
  set(bin "${CMAKE_BINARY_DIR}/target-${cpu}")
  set(HALFSPIN_TARGET_BIN_${cpu} "${bin}")
  add_test(NAME target.${cpu}.build
    COMMAND "${CMAKE_COMMAND}" "-DSOURCE_DIR=${CMAKE_CURRENT_LIST_DIR}" "-DBINARY_DIR=${bin}"
            "-DCPU=${cpu}" "-DTOOLCHAIN=${PROJECT_SOURCE_DIR}/cmake/arm-none-eabi.cmake"
            "-DGENERATOR=${CMAKE_GENERATOR}"
            -P "${CMAKE_CURRENT_LIST_DIR}/build_target.cmake")
  set_tests_properties(target.${cpu}.build PROPERTIES
    LABELS target FIXTURES_SETUP target_${cpu} RESOURCE_LOCK target_build_${cpu} TIMEOUT 1200)

  set(qemu "${HALFSPIN_QEMU_ARM}" -M ${machine} -nographic -monitor none
           -semihosting-config enable=on,target=native -kernel)
  add_test(NAME target.${cpu}.tests COMMAND ${qemu} "${bin}/halfspin_target_tests.elf")
  set_tests_properties(target.${cpu}.tests PROPERTIES
    LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 600)

  # The C interface test (tests/c_interface) on the core: bit-identical to the C++ propagator.
  add_test(NAME target.${cpu}.c_interface COMMAND ${qemu} "${bin}/halfspin_c_interface_tests.elf")
  set_tests_properties(target.${cpu}.c_interface PROPERTIES
    LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 600
    PASS_REGULAR_EXPRESSION "c_interface: [1-9][0-9]* passed, 0 failed")

  include("${CMAKE_CURRENT_LIST_DIR}/host_firmware.cmake")
  include("${CMAKE_CURRENT_LIST_DIR}/host_footprint.cmake")
  include("${CMAKE_CURRENT_LIST_DIR}/host_replay.cmake")
endforeach()
