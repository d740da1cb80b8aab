# Host side of the firmware example (examples/firmware): one ctest per core,
# target.<cpu>.firmware_example, runs the image under qemu and passes only if qemu's exit status
# (main's return value) is 0 AND the report has the lines below. ctest's PASS_REGULAR_EXPRESSION
# alone would ignore the exit status, so the test runs this same file as a cmake -P driver.
#
# Included from host_tests.cmake inside its loop over cores (cpu, bin, qemu are set there); run
# with -P (CMAKE_SCRIPT_MODE_FILE set) it is the driver, with inputs QEMU (the qemu command up to
# -kernel, '|'-separated) and ELF.

# Lines the report must contain (each a regular expression).
set(_halfspin_firmware_report_lines
  "SysTick: SYST_CALIB TENMS 9999, NOREF 0, SKEW 0 -> reference clock 1.000 MHz, reload 999 for 1 ms"
  "status counts: ok [0-9]+ waiting_for_samples [0-9]+ non_finite 1 non_positive_step 1 step_too_long 1 over_range 1 no_tick_period 0"
  "\\[ok\\] final attitude within the budget of the closed form"
  "\\[ok\\] every injected fault rejected with the right status \\(4 of 4\\)"
  "\\[ok\\] every simulated IMU frame was produced"
  "firmware example: PASS")

if(CMAKE_SCRIPT_MODE_FILE)
  string(REPLACE "|" ";" _qemu "${QEMU}")
  # Output goes to a file, not a pipe: qemu's semihosting console writes without blocking and was
  # seen to drop lines into a full pipe (tests/target/replay/compare_replay.cmake measured it).
  get_filename_component(_dir "${ELF}" DIRECTORY)
  set(_out_file "${_dir}/halfspin_firmware_example.out")
  execute_process(COMMAND ${_qemu} "${ELF}"
    OUTPUT_FILE "${_out_file}" ERROR_VARIABLE _err RESULT_VARIABLE _rc TIMEOUT 120)
  file(READ "${_out_file}" _out)
  message("${_out}${_err}")
  if(NOT _rc STREQUAL "0")
    message(FATAL_ERROR "the firmware example exited with status '${_rc}', not 0")
  endif()
  foreach(_line IN LISTS _halfspin_firmware_report_lines)
    if(NOT _out MATCHES "${_line}")
      message(FATAL_ERROR "the firmware example's report lacks a line matching: ${_line}")
    endif()
  endforeach()
  return()
endif()

string(REPLACE ";" "|" _halfspin_qemu_joined "${qemu}")
add_test(NAME target.${cpu}.firmware_example
  COMMAND "${CMAKE_COMMAND}" "-DQEMU=${_halfspin_qemu_joined}"
          "-DELF=${bin}/halfspin_firmware_example.elf" -P "${CMAKE_CURRENT_LIST_FILE}")
set_tests_properties(target.${cpu}.firmware_example PROPERTIES
  LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 180)
