# Runs one libFuzzer harness for a ctest (fuzz/CMakeLists.txt): cmake -DHARNESS=… -DSEEDS=dir
# -DREGRESSIONS=dir -DWORK=dir -DMODE=fuzz|replay [-DSECONDS=60] -P run_harness.cmake
#   replay: every seed and regression file through the harness once (fails if any crashes).
#   fuzz:   a bounded run on a fresh copy of both directories in WORK (the repository is never
#           written); new corpus entries stay in WORK/corpus, a crash input is saved as
#           WORK/crash-<sha1> (copy it into fuzz/regressions/<harness>/). libFuzzer's output goes
#           to WORK/fuzz.log; its summary ("Done N runs in S second(s)") is printed here.
foreach(var HARNESS SEEDS REGRESSIONS WORK MODE)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "run_harness.cmake: -D${var}= missing")
  endif()
endforeach()

# Input files: every regular file except dot files (.gitkeep) and README*.
set(inputs)
foreach(dir "${SEEDS}" "${REGRESSIONS}")
  if(IS_DIRECTORY "${dir}")
    file(GLOB found LIST_DIRECTORIES false "${dir}/*")
    foreach(f IN LISTS found)
      get_filename_component(name "${f}" NAME)
      if(NOT name MATCHES "^\\." AND NOT name MATCHES "^README")
        list(APPEND inputs "${f}")
      endif()
    endforeach()
  endif()
endforeach()
list(SORT inputs)
list(LENGTH inputs count)
if(count EQUAL 0)
  message(FATAL_ERROR "no seed or regression inputs in ${SEEDS} and ${REGRESSIONS}")
endif()

if(MODE STREQUAL "replay")
  # libFuzzer runs each file given by path once and exits.
  execute_process(COMMAND "${HARNESS}" ${inputs} RESULT_VARIABLE rc OUTPUT_VARIABLE out
                  ERROR_VARIABLE out)
  if(NOT rc EQUAL 0)
    message("${out}")
    message(FATAL_ERROR "replay of ${count} inputs failed (exit ${rc})")
  endif()
  message(STATUS "replayed ${count} seed and regression inputs: no crash, no property violation")
  return()
endif()

if(NOT MODE STREQUAL "fuzz")
  message(FATAL_ERROR "MODE must be fuzz or replay")
endif()
if(NOT DEFINED SECONDS)
  set(SECONDS 60)
endif()
file(REMOVE_RECURSE "${WORK}")
file(MAKE_DIRECTORY "${WORK}/corpus")
file(COPY ${inputs} DESTINATION "${WORK}/corpus")
execute_process(
  COMMAND "${HARNESS}" -max_total_time=${SECONDS} -timeout=20 -rss_limit_mb=2048
          -max_len=4096 -print_final_stats=1 -artifact_prefix=${WORK}/ "${WORK}/corpus"
  RESULT_VARIABLE rc OUTPUT_FILE "${WORK}/fuzz.log" ERROR_FILE "${WORK}/fuzz.log")
file(STRINGS "${WORK}/fuzz.log" done REGEX "^Done [0-9]+ runs in [0-9]+ second")
file(STRINGS "${WORK}/fuzz.log" stats REGEX "^stat::(number_of_executed_units|average_exec_per_sec|new_units_added|peak_rss_mb)")
file(STRINGS "${WORK}/fuzz.log" cov REGEX "^#[0-9]+[ \t]+DONE")
get_filename_component(harness_name "${HARNESS}" NAME)
if(NOT rc EQUAL 0)
  file(READ "${WORK}/fuzz.log" log)
  string(LENGTH "${log}" len)
  if(len GREATER 20000)
    math(EXPR start "${len} - 20000")
    string(SUBSTRING "${log}" ${start} -1 log)
  endif()
  message("${log}")
  file(GLOB crashes "${WORK}/crash-*" "${WORK}/timeout-*" "${WORK}/oom-*" "${WORK}/leak-*")
  message(FATAL_ERROR "${harness_name}: libFuzzer exit ${rc}; input saved: ${crashes} "
                      "(reproduce: ${HARNESS} <file>; copy it into fuzz/regressions/)")
endif()
if(NOT done)
  message(FATAL_ERROR "${harness_name}: no 'Done N runs' line in ${WORK}/fuzz.log")
endif()
message("${harness_name}: ${count} seeds and regressions, ${SECONDS} s")
foreach(line IN LISTS cov stats done)
  message("${line}")
endforeach()
