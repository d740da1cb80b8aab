# cmake -DBUILD_DIR=<dir> -DTARGET=<target> [-DCONFIG=<cfg>] -DSOURCE=<file.cpp> -DMARKER=<text>
#       -DEXPECT_FAILURE=<0|1> [-DDIAGNOSTIC=<regex>] [-DMENTION=<regex>] -P CompileCheck.cmake
#
# Builds <target> of the build tree <dir> with `cmake --build` and judges the result.
# EXPECT_FAILURE=0 (positive control): the build must succeed.
# EXPECT_FAILURE=1: the build must fail for the right reason, which is all of:
#   - the build exits non-zero;
#   - at least one compiler error is reported, and every line of the output holding "error:"
#     points at <file.cpp>:<N>: where N is the one line of <file.cpp> that holds "// <text>";
#   - some such error line matches <DIAGNOSTIC> (the compiler's wording for "no operator* for these
#     operand types") and <MENTION> (the offending frame), so a typo elsewhere, a missing header
#     or a broken include path cannot pass as the expected failure.

cmake_minimum_required(VERSION 3.20)
foreach(var BUILD_DIR TARGET SOURCE MARKER EXPECT_FAILURE)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "CompileCheck: pass -D${var}=...")
  endif()
endforeach()

# The marked line: exactly one line carries the marker as a comment.
file(STRINGS "${SOURCE}" source_lines)
set(number 0)
set(marked "")
foreach(text IN LISTS source_lines)
  math(EXPR number "${number} + 1")
  string(FIND "${text}" "// ${MARKER}" at)
  if(NOT at EQUAL -1)
    list(APPEND marked ${number})
  endif()
endforeach()
list(LENGTH marked marked_count)
if(NOT marked_count EQUAL 1)
  message(FATAL_ERROR "CompileCheck: ${SOURCE} must hold \"// ${MARKER}\" on exactly one line "
                      "(found on lines: ${marked})")
endif()

set(config_args "")
if(DEFINED CONFIG AND NOT CONFIG STREQUAL "")
  set(config_args --config "${CONFIG}")
endif()
execute_process(
  COMMAND "${CMAKE_COMMAND}" --build "${BUILD_DIR}" --target "${TARGET}" ${config_args}
  RESULT_VARIABLE status OUTPUT_VARIABLE out ERROR_VARIABLE err)
set(log "${out}${err}")
message("---- build output of ${TARGET} ----\n${log}----------------------------------")

if(NOT EXPECT_FAILURE)
  if(NOT status EQUAL 0)
    message(FATAL_ERROR "CompileCheck: positive control ${TARGET} failed to build (status ${status})")
  endif()
  message(STATUS "CompileCheck: positive control ${TARGET} builds")
  return()
endif()

if(status EQUAL 0)
  message(FATAL_ERROR "CompileCheck: ${TARGET} built, but it must be rejected by the compiler")
endif()

get_filename_component(source_name "${SOURCE}" NAME)
string(REPLACE ";" "," log_list "${log}")
string(REPLACE "\n" ";" log_list "${log_list}")
set(error_count 0)
set(right_reason FALSE)
set(stray "")
foreach(text IN LISTS log_list)
  string(FIND "${text}" "error:" at)
  if(at EQUAL -1)
    continue()
  endif()
  math(EXPR error_count "${error_count} + 1")
  string(FIND "${text}" "${source_name}:${marked}:" at_marker)
  if(at_marker EQUAL -1)
    string(APPEND stray "  ${text}\n")
    continue()
  endif()
  set(ok TRUE)
  if(DEFINED DIAGNOSTIC AND NOT text MATCHES "${DIAGNOSTIC}")
    set(ok FALSE)
  endif()
  if(DEFINED MENTION AND NOT text MATCHES "${MENTION}")
    set(ok FALSE)
  endif()
  if(ok)
    set(right_reason TRUE)
  endif()
endforeach()

if(error_count EQUAL 0)
  message(FATAL_ERROR "CompileCheck: ${TARGET} failed (status ${status}) without a compiler error")
endif()
if(NOT stray STREQUAL "")
  message(FATAL_ERROR "CompileCheck: ${TARGET} has errors other than at ${source_name}:${marked}:\n${stray}")
endif()
if(NOT right_reason)
  message(FATAL_ERROR "CompileCheck: the error at ${source_name}:${marked} does not match "
                      "'${DIAGNOSTIC}' and '${MENTION}': the build failed for another reason")
endif()
message(STATUS "CompileCheck: ${TARGET} is rejected at ${source_name}:${marked} for the expected reason")
