# cmake -P driver of the bit-exact replay test: runs the replay program on the target (under qemu)
# and on the host, and compares their outputs line by line.
# Inputs:
#   TARGET_COMMAND  the qemu command line and image, arguments separated by "|"
#   HOST_COMMAND    the host replay program
#   OUT_DIR         where both outputs are written (kept for inspection)
#   EXPECT          "match": every Q/H/E line must be identical (the replay test);
#                   "differ": some Q/H line must differ (the sensitivity check)
# Lines starting with Q (one step), H (a configuration's summary) and E (end marker) are
# required to match; L lines (steps through libm) are compared and reported, never required;
# # lines are platform information.
# The outputs go to files, not pipes: qemu's semihosting console was seen to drop lines when its
# standard output is a pipe that fills up (the writes are non-blocking).
foreach(var TARGET_COMMAND HOST_COMMAND OUT_DIR EXPECT)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "compare_replay.cmake needs -D${var}=...")
  endif()
endforeach()
string(REPLACE "|" ";" target_command "${TARGET_COMMAND}")
file(MAKE_DIRECTORY "${OUT_DIR}")

function(run_replay side)
  execute_process(COMMAND ${ARGN}
    OUTPUT_FILE "${OUT_DIR}/${side}.txt" ERROR_FILE "${OUT_DIR}/${side}.err"
    RESULT_VARIABLE result TIMEOUT 800)
  if(NOT result STREQUAL "0")
    file(READ "${OUT_DIR}/${side}.err" err)
    message(FATAL_ERROR "the ${side} replay program failed (exit status '${result}'); output in "
                        "${OUT_DIR}/${side}.txt\n${err}")
  endif()
endfunction()
run_replay(target ${target_command})
run_replay(host ${HOST_COMMAND})

# Platform lines, for the log.
foreach(side target host)
  file(STRINGS "${OUT_DIR}/${side}.txt" info REGEX "^# ")
  string(REPLACE ";" "\n  " info "${info}")
  message("${side}:\n  ${info}")
endforeach()

file(STRINGS "${OUT_DIR}/target.txt" target_lines REGEX "^[QHE] ")
file(STRINGS "${OUT_DIR}/host.txt" host_lines REGEX "^[QHE] ")
file(STRINGS "${OUT_DIR}/target.txt" target_libm REGEX "^L ")
file(STRINGS "${OUT_DIR}/host.txt" host_libm REGEX "^L ")

# Both runs must be complete: the end marker is the last required line.
foreach(side target host)
  list(LENGTH ${side}_lines n)
  if(n LESS 2)
    message(FATAL_ERROR "the ${side} output has no replay lines")
  endif()
  list(GET ${side}_lines -1 last)
  if(NOT last STREQUAL "E end of replay")
    message(FATAL_ERROR "the ${side} output is incomplete (last line '${last}')")
  endif()
endforeach()

# First differing line of two lists, or nothing; out_index/out_a/out_b describe it.
function(first_difference list_a list_b out_index out_a out_b)
  set(i 0)
  foreach(a b IN ZIP_LISTS ${list_a} ${list_b})
    if(NOT a STREQUAL b)
      set(${out_index} ${i} PARENT_SCOPE)
      set(${out_a} "${a}" PARENT_SCOPE)
      set(${out_b} "${b}" PARENT_SCOPE)
      return()
    endif()
    math(EXPR i "${i} + 1")
  endforeach()
  set(${out_index} "" PARENT_SCOPE)
endfunction()

# The libm-dependent lines: report how many differ, never fail on them.
list(LENGTH target_libm libm_count)
set(libm_differ 0)
foreach(a b IN ZIP_LISTS target_libm host_libm)
  if(NOT a STREQUAL b)
    math(EXPR libm_differ "${libm_differ} + 1")
  endif()
endforeach()
set(libm_report "libm-dependent lines (not required to replay): ${libm_differ} of ${libm_count} differ")
first_difference(target_libm host_libm libm_index libm_a libm_b)
if(NOT libm_index STREQUAL "")
  string(APPEND libm_report "; first:\n  target: ${libm_a}\n  host:   ${libm_b}")
endif()
message("${libm_report}")
file(WRITE "${OUT_DIR}/libm_report.txt" "${libm_report}\n")

list(LENGTH target_lines target_count)
list(LENGTH host_lines host_count)
file(STRINGS "${OUT_DIR}/target.txt" summaries REGEX "^H ")
list(LENGTH summaries configurations)
if(target_lines STREQUAL host_lines)
  if(EXPECT STREQUAL "match")
    message("bit-exact: ${configurations} configurations, ${target_count} lines identical")
    return()
  endif()
  message(FATAL_ERROR "the target output is identical to the host's (${target_count} lines) "
                      "although this image was built to differ: the comparison is not sensitive")
endif()

first_difference(target_lines host_lines index target_line host_line)
if(index STREQUAL "")  # one list is a prefix of the other
  set(index "${target_count}/${host_count}")
  set(target_line "(${target_count} lines)")
  set(host_line "(${host_count} lines)")
endif()
set(report "first difference at compared line ${index} (tag, configuration, step, w x y z, estimate):")
string(APPEND report "\n  target: ${target_line}\n  host:   ${host_line}")
if(EXPECT STREQUAL "differ")
  message("as expected, the outputs differ; ${report}")
  return()
endif()
message(FATAL_ERROR "replay is NOT bit-exact; ${report}")
