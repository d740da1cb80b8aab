# The stepper tables of docs/steppers.md are halfspin-propagator-sizes' output: every table the tool
# prints must appear in that document line for line. The tables are generated, not written by hand:
# with -DUPDATE=ON this script rewrites each table that starts with the same header line as one
# of the tool's tables (the build target halfspin-refresh-stepper-tables runs it so), and without it
# checks them (the ctest examples.stepper_tables).
# Usage: cmake -DTOOL=<halfspin-propagator-sizes> -DDOC=<docs/steppers.md> [-DUPDATE=ON]
#              -P CheckStepperTables.cmake
execute_process(COMMAND "${TOOL}" OUTPUT_VARIABLE out RESULT_VARIABLE rc)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "${TOOL} failed (${rc})")
endif()
file(READ "${DOC}" readme)
string(REPLACE "\n\n" ";" tables "${out}")
set(n 0)
set(changed 0)
foreach(table IN LISTS tables)
  string(STRIP "${table}" table)
  if(table STREQUAL "")
    continue()
  endif()
  math(EXPR n "${n} + 1")
  string(FIND "${readme}" "${table}\n" at)
  if(NOT at EQUAL -1)
    continue()
  endif()
  string(REGEX MATCH "^[^\n]*" head "${table}")
  if(NOT UPDATE)
    message(FATAL_ERROR "${DOC} lacks table ${n} of halfspin-propagator-sizes as it prints it now "
                        "(header: ${head}); run `cmake --build <build> --target "
                        "halfspin-refresh-stepper-tables` to regenerate the tables")
  endif()
  # The document's table with the same header: from its header line to the last line starting '|'.
  string(FIND "${readme}" "\n${head}\n" start)
  if(start EQUAL -1)
    message(FATAL_ERROR "${DOC} has no table with the header of table ${n} (${head}); add the "
                        "header line where the table belongs, then rerun")
  endif()
  math(EXPR start "${start} + 1")
  string(SUBSTRING "${readme}" ${start} -1 rest)
  string(REGEX MATCH "^(\\|[^\n]*\n)+" old "${rest}")
  string(LENGTH "${old}" old_length)
  string(SUBSTRING "${readme}" 0 ${start} before)
  math(EXPR after_start "${start} + ${old_length}")
  string(SUBSTRING "${readme}" ${after_start} -1 after)
  set(readme "${before}${table}\n${after}")
  math(EXPR changed "${changed} + 1")
endforeach()
if(UPDATE AND changed GREATER 0)
  file(WRITE "${DOC}" "${readme}")
  message(STATUS "${changed} of ${n} tables of halfspin-propagator-sizes rewritten in ${DOC}")
else()
  message(STATUS "${n} tables of halfspin-propagator-sizes found in ${DOC}")
endif()
