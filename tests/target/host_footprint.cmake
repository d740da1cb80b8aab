# Host-side tests of the footprint images and the hygiene of every target image (ctest label
# "target"; included by host_tests.cmake inside its loop over cores, with cpu, machine, bin and
# qemu set). Scripts in tests/target/footprint/; the footprint and cycle reports are
# bench/target/*.py (Python, not needed by these tests).
find_program(HALFSPIN_ARM_NM arm-none-eabi-nm)
if(NOT HALFSPIN_ARM_NM)
  message(FATAL_ERROR "the hygiene tests need arm-none-eabi-nm (Debian: binutils-arm-none-eabi)")
endif()
set(_footprint_scripts "${CMAKE_CURRENT_LIST_DIR}/footprint")

# Every linked image of the target build: no heap, no exception machinery, no double helper in
# the float footprint images (rules and image classes in check_hygiene.cmake).
add_test(NAME target.${cpu}.hygiene
  COMMAND "${CMAKE_COMMAND}" "-DBINARY_DIR=${bin}" "-DNM=${HALFSPIN_ARM_NM}"
          -P "${_footprint_scripts}/check_hygiene.cmake")
set_tests_properties(target.${cpu}.hygiene PROPERTIES
  LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 600)

# Each rule can fail: the fixtures break them on purpose and the check must say so, by name.
set(_all_rules "exceptions,cxx-heap,c-heap,double")
set(_fixture_expectations
  "heap|cxx-heap:_Znwj,cxx-heap:_ZdlPv,c-heap:malloc"
  "double|double:__aeabi_f2d,double:__aeabi_dmul,double:__aeabi_d2f"
  "exceptions|exceptions:__cxa_throw,exceptions:__gxx_personality_v0")
foreach(_entry IN LISTS _fixture_expectations)
  string(REPLACE "|" ";" _fields "${_entry}")
  list(GET _fields 0 _fixture)
  list(GET _fields 1 _expect)
  add_test(NAME target.${cpu}.hygiene_detects_${_fixture}
    COMMAND "${CMAKE_COMMAND}" "-DIMAGE=${bin}/hygiene-fixtures/hygiene_fixture_${_fixture}.elf"
            "-DRULES=${_all_rules}" "-DEXPECT=${_expect}" "-DNM=${HALFSPIN_ARM_NM}"
            -P "${_footprint_scripts}/expect_violation.cmake")
  set_tests_properties(target.${cpu}.hygiene_detects_${_fixture} PROPERTIES
    LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 120)
endforeach()

# The footprint images are working programs: each runs its input through and exits 0.
add_test(NAME target.${cpu}.footprint_images_run
  COMMAND "${CMAKE_COMMAND}" "-DBINARY_DIR=${bin}" "-DQEMU=${HALFSPIN_QEMU_ARM}"
          "-DMACHINE=${machine}" -P "${_footprint_scripts}/run_images.cmake")
set_tests_properties(target.${cpu}.footprint_images_run PROPERTIES
  LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 900)
