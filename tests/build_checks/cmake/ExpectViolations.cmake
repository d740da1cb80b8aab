# cmake -DCHECKER=<script.cmake> -DFIXTURE=<dir> -P ExpectViolations.cmake
#
# Tests a checker script on a fixture: runs `cmake -DHALFSPIN_INCLUDE_DIR=<dir>/include -P
# <script>` and compares the violations it prints (lines "<root>/<file>:...") with
# <dir>/expected.txt, one expected violation per line, written relative to <dir>/include and
# matched as a prefix ("halfspin/core/x.hpp:4: banned standard header <vector>"). Passes only when
# every expected violation is reported exactly once, nothing else is reported, and the checker's
# exit status agrees (non-zero when violations are expected, zero for an empty expected.txt).

cmake_minimum_required(VERSION 3.20)
foreach(var CHECKER FIXTURE)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "ExpectViolations: pass -D${var}=...")
  endif()
endforeach()
get_filename_component(root "${FIXTURE}/include" ABSOLUTE)
if(NOT EXISTS "${FIXTURE}/expected.txt")
  message(FATAL_ERROR "ExpectViolations: ${FIXTURE}/expected.txt is missing")
endif()
file(STRINGS "${FIXTURE}/expected.txt" expected)
list(FILTER expected EXCLUDE REGEX "^[ \t]*$")

execute_process(
  COMMAND "${CMAKE_COMMAND}" "-DHALFSPIN_INCLUDE_DIR=${root}" -P "${CHECKER}"
  RESULT_VARIABLE status OUTPUT_VARIABLE out ERROR_VARIABLE err)
message("---- checker output ----\n${out}${err}------------------------")

# Violations are the lines that start with the fixture's root.
string(REPLACE ";" "," text "${out}${err}")
string(REPLACE "\n" ";" text "${text}")
set(reported "")
string(LENGTH "${root}/" root_length)
foreach(line IN LISTS text)
  string(FIND "${line}" "${root}/" at)
  if(at EQUAL 0)
    string(SUBSTRING "${line}" ${root_length} -1 relative)
    list(APPEND reported "${relative}")
  endif()
endforeach()

set(problems "")
foreach(want IN LISTS expected)
  set(hits 0)
  foreach(got IN LISTS reported)
    string(FIND "${got}" "${want}" at)
    if(at EQUAL 0)
      math(EXPR hits "${hits} + 1")
    endif()
  endforeach()
  if(NOT hits EQUAL 1)
    string(APPEND problems "  expected once, reported ${hits} time(s): ${want}\n")
  endif()
endforeach()
foreach(got IN LISTS reported)
  set(known FALSE)
  foreach(want IN LISTS expected)
    string(FIND "${got}" "${want}" at)
    if(at EQUAL 0)
      set(known TRUE)
    endif()
  endforeach()
  if(NOT known)
    string(APPEND problems "  reported but not expected: ${got}\n")
  endif()
endforeach()

list(LENGTH expected expected_count)
if(expected_count GREATER 0 AND status EQUAL 0)
  string(APPEND problems "  the checker exited 0 although violations are expected\n")
elseif(expected_count EQUAL 0 AND NOT status EQUAL 0)
  string(APPEND problems "  the checker exited ${status} on a fixture with no violation\n")
endif()

if(NOT problems STREQUAL "")
  message(FATAL_ERROR "ExpectViolations: ${CHECKER} on ${FIXTURE}:\n${problems}")
endif()
message(STATUS "ExpectViolations: ${CHECKER} reported exactly the ${expected_count} expected "
               "violation(s) on ${FIXTURE}")
