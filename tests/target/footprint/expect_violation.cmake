# cmake -P script: proves a hygiene rule can fail. Runs check_hygiene.cmake on a fixture image
# that breaks rules on purpose and passes only if that check FAILS and its report names every
# expected rule with the expected symbol (so the failure is for the right reason, not a missing
# file or a crashed nm).
# Inputs: IMAGE, RULES (comma-separated rules to apply), EXPECT (comma-separated rule:symbol),
# NM (optional).
cmake_minimum_required(VERSION 3.25)
if(NOT IMAGE OR NOT RULES OR NOT EXPECT)
  message(FATAL_ERROR "expect_violation.cmake needs IMAGE, RULES and EXPECT")
endif()
if(NOT EXISTS "${IMAGE}")
  message(FATAL_ERROR "no fixture image ${IMAGE}")
endif()
set(nm_arg "")
if(NM)
  set(nm_arg "-DNM=${NM}")
endif()
execute_process(
  COMMAND "${CMAKE_COMMAND}" "-DIMAGE=${IMAGE}" "-DRULES=${RULES}" ${nm_arg}
          -P "${CMAKE_CURRENT_LIST_DIR}/check_hygiene.cmake"
  OUTPUT_VARIABLE out ERROR_VARIABLE err RESULT_VARIABLE result)
set(text "${out}${err}")
message("${text}")
if(result EQUAL 0)
  message(FATAL_ERROR "the hygiene check PASSED on ${IMAGE}, which breaks it on purpose")
endif()
if(NOT text MATCHES "VIOLATION ")
  message(FATAL_ERROR "the hygiene check failed without reporting a violation (wrong reason)")
endif()
string(REPLACE "," ";" EXPECT "${EXPECT}")
foreach(pair IN LISTS EXPECT)
  string(REPLACE ":" ";" parts "${pair}")
  list(GET parts 0 rule)
  list(GET parts 1 symbol)
  # The rule's entry in the report: "<rule>: sym sym ...;"
  if(NOT text MATCHES "(^|[ :;])${rule}:( [^;]*)? ${symbol}[ ;]")
    message(FATAL_ERROR "expected the '${rule}' rule to name ${symbol}; it did not")
  endif()
  message("detected as expected: ${rule} names ${symbol}")
endforeach()
