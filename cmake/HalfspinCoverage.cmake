# The coverage_report target (the `coverage` workflow preset runs it after the test suite): gcovr
# (Debian `gcovr`) reads the gcov data that the --coverage build left while the tests ran and reports
# line and branch coverage of include/ only — the library, not its tests or tools. It fails if line
# coverage is below HALFSPIN_COVERAGE_MIN_LINES percent. Reports: build/coverage/coverage.txt (per
# header) and build/coverage/coverage-summary.json (totals, per header).
set(HALFSPIN_COVERAGE_MIN_LINES 95 CACHE STRING "Least line coverage of include/ (percent)")
find_program(HALFSPIN_GCOVR gcovr REQUIRED)
add_custom_target(coverage_report
  COMMAND "${HALFSPIN_GCOVR}"
          --root "${PROJECT_SOURCE_DIR}"
          --filter "${PROJECT_SOURCE_DIR}/include/"
          --object-directory "${PROJECT_BINARY_DIR}"
          --exclude-unreachable-branches --exclude-throw-branches
          --txt "${PROJECT_BINARY_DIR}/coverage.txt"
          --json-summary-pretty --json-summary "${PROJECT_BINARY_DIR}/coverage-summary.json"
          --print-summary
          --fail-under-line "${HALFSPIN_COVERAGE_MIN_LINES}"
  WORKING_DIRECTORY "${PROJECT_BINARY_DIR}"
  COMMENT "Coverage of include/ (gcovr); fails below ${HALFSPIN_COVERAGE_MIN_LINES}% of lines"
  VERBATIM)
