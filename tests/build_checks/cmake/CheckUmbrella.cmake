# cmake -DHALFSPIN_INCLUDE_DIR=<dir> -P CheckUmbrella.cmake
#
# The umbrella header <dir>/halfspin/halfspin.hpp must reach, by #include directives outside
# comments, every other header under <dir>/halfspin/ (so that #include <halfspin/halfspin.hpp>
# gives a user the whole library), and include nothing that does not exist. A header is reached
# when the umbrella includes it or includes a header that reaches it: each family and
# infrastructure header is listed in the umbrella, and a stepper header is reached through the
# stepper catalogue, so that adding a stepper does not mean editing the umbrella. Prints each gap as <file>: <what> and
# exits non-zero; also fails, saying so, while the umbrella header does not exist.

cmake_minimum_required(VERSION 3.20)
include("${CMAKE_CURRENT_LIST_DIR}/SourceScan.cmake")

if(NOT DEFINED HALFSPIN_INCLUDE_DIR)
  message(FATAL_ERROR "CheckUmbrella: pass -DHALFSPIN_INCLUDE_DIR=<the include/ directory>")
endif()
get_filename_component(root "${HALFSPIN_INCLUDE_DIR}" ABSOLUTE)
set(umbrella "${root}/halfspin/halfspin.hpp")
if(NOT EXISTS "${umbrella}")
  message("${umbrella}: the umbrella header does not exist")
  message(FATAL_ERROR "CheckUmbrella: ${umbrella} is missing; it must exist and include every "
                      "header under ${root}/halfspin/")
endif()

file(GLOB_RECURSE headers LIST_DIRECTORIES false RELATIVE "${root}"
  "${root}/halfspin/*.hpp" "${root}/halfspin/*.h")
list(REMOVE_ITEM headers "halfspin/halfspin.hpp")
list(SORT headers)

set(included "")
set(gaps 0)
# Breadth-first over the halfspin/ headers reached from the umbrella; only the umbrella's own
# directives are checked for targets that do not exist (the compiler checks the others).
set(queue "halfspin/halfspin.hpp")
set(visited "")
while(queue)
  list(POP_FRONT queue current)
  list(APPEND visited "${current}")
  halfspin_scan_code_lines("${root}/${current}" code_lines)
  foreach(entry IN LISTS code_lines)
    string(REGEX MATCH "^([0-9]+):(.*)$" _ "${entry}")
    set(line "${CMAKE_MATCH_1}")
    set(code "${CMAKE_MATCH_2}")
    if(code MATCHES "^[ \t]*#[ \t]*include[ \t]*[\"<]([^\">]*)[\">]")
      set(target "${CMAKE_MATCH_1}")
      if(NOT target MATCHES "^halfspin/")
        continue()
      endif()
      if(NOT EXISTS "${root}/${target}")
        if(current STREQUAL "halfspin/halfspin.hpp")
          message("${umbrella}:${line}: includes \"${target}\", which does not exist")
          math(EXPR gaps "${gaps} + 1")
        endif()
        continue()
      endif()
      list(FIND included "${target}" seen)
      if(seen EQUAL -1)
        list(APPEND included "${target}")
        list(FIND visited "${target}" done)
        if(done EQUAL -1)
          list(APPEND queue "${target}")
        endif()
      endif()
    endif()
  endforeach()
endwhile()

foreach(header IN LISTS headers)
  list(FIND included "${header}" found)
  if(found EQUAL -1)
    message("${umbrella}: does not include \"${header}\"")
    math(EXPR gaps "${gaps} + 1")
  endif()
endforeach()

if(gaps GREATER 0)
  message(FATAL_ERROR "CheckUmbrella: ${umbrella} is incomplete or stale (${gaps} problem(s))")
endif()
list(LENGTH headers count)
message(STATUS "CheckUmbrella: ${umbrella} reaches all ${count} other header(s)")
