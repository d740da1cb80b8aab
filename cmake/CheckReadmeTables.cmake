# The README's stepper tables are halfspin-propagator-sizes' output: every table the tool prints
# must appear in README.md line for line (run the tool and paste its output to refresh them).
# Usage: cmake -DTOOL=<halfspin-propagator-sizes> -DREADME=<README.md> -P CheckReadmeTables.cmake
execute_process(COMMAND "${TOOL}" OUTPUT_VARIABLE out RESULT_VARIABLE rc)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "${TOOL} failed (${rc})")
endif()
file(READ "${README}" readme)
string(REPLACE "\n\n" ";" tables "${out}")
set(n 0)
foreach(table IN LISTS tables)
  string(STRIP "${table}" table)
  if(table STREQUAL "")
    continue()
  endif()
  math(EXPR n "${n} + 1")
  string(FIND "${readme}" "${table}" at)
  if(at EQUAL -1)
    string(REGEX MATCH "^[^\n]*" head "${table}")
    message(FATAL_ERROR "README.md lacks table ${n} of halfspin-propagator-sizes as it prints it now "
                        "(header: ${head}); rerun the tool and paste its output")
  endif()
endforeach()
message(STATUS "${n} tables of halfspin-propagator-sizes found in README.md")
