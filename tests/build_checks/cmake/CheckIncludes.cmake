# cmake -DHALFSPIN_INCLUDE_DIR=<dir> -P CheckIncludes.cmake
#
# Enforces the rules for include/ (DESIGN.md, "Rules for everything under include/") on every file
# below <dir> (the include/ directory, or a test fixture laid out the same way):
#   - #include <...> only of <cmath> <cstdint> <cstddef> <limits> <type_traits> <array> <utility>,
#     and <complex> only in the SU(2) / Cayley–Klein headers (su2_matrix.hpp, cayley_klein.hpp);
#   - #include "..." only of an existing file under halfspin/, and never of a higher layer
#     (core < representations < propagation < bounds < truth < the umbrella halfspin/*.hpp);
#   - outside comments and literals, none of the words that allocate, throw or need RTTI:
#     new, malloc, calloc, realloc, aligned_alloc, throw, try, catch, typeid, dynamic_cast,
#     and no noexcept(false).
# Prints every violation as <file>:<line>: <what> and exits non-zero if there is any; also fails
# when <dir> holds no file at all, so a wrong path cannot pass as "clean".

cmake_minimum_required(VERSION 3.20)
include("${CMAKE_CURRENT_LIST_DIR}/SourceScan.cmake")

if(NOT DEFINED HALFSPIN_INCLUDE_DIR)
  message(FATAL_ERROR "CheckIncludes: pass -DHALFSPIN_INCLUDE_DIR=<the include/ directory>")
endif()
get_filename_component(root "${HALFSPIN_INCLUDE_DIR}" ABSOLUTE)
if(NOT IS_DIRECTORY "${root}")
  message(FATAL_ERROR "CheckIncludes: ${root} is not a directory")
endif()

set(allowed_std_headers cmath cstdint cstddef limits type_traits array complex utility)
set(complex_headers su2_matrix.hpp cayley_klein.hpp)
# Rank of each layer; a file may include its own layer or a lower one. Files directly under
# halfspin/ (the umbrella) rank above every layer.
set(layers core representations propagation bounds truth)
set(umbrella_rank 100)
set(banned_words_regex
  "(^|[^A-Za-z0-9_])(new|malloc|calloc|realloc|aligned_alloc|throw|try|catch|typeid|dynamic_cast)([^A-Za-z0-9_]|$)")

# layer_rank(<path relative to root> <out-rank> <out-name>): rank -1 for a path outside halfspin/,
# -2 for an unknown layer folder.
function(layer_rank rel out_rank out_name)
  if(NOT rel MATCHES "^halfspin/(.*)$")
    set(${out_rank} -1 PARENT_SCOPE)
    set(${out_name} "outside halfspin/" PARENT_SCOPE)
    return()
  endif()
  set(tail "${CMAKE_MATCH_1}")
  if(NOT tail MATCHES "/")
    set(${out_rank} ${umbrella_rank} PARENT_SCOPE)
    set(${out_name} "the umbrella level halfspin/" PARENT_SCOPE)
    return()
  endif()
  string(REGEX REPLACE "/.*$" "" folder "${tail}")
  list(FIND layers "${folder}" rank)
  if(rank EQUAL -1)
    set(rank -2)
  endif()
  set(${out_rank} ${rank} PARENT_SCOPE)
  set(${out_name} "${folder}" PARENT_SCOPE)
endfunction()

set(violations 0)
macro(report file line what)
  message("${file}:${line}: ${what}")
  math(EXPR violations "${violations} + 1")
endmacro()

file(GLOB_RECURSE files LIST_DIRECTORIES false "${root}/*")
list(SORT files)
list(LENGTH files file_count)
if(file_count EQUAL 0)
  message(FATAL_ERROR "CheckIncludes: no file under ${root}; nothing was checked")
endif()

foreach(file IN LISTS files)
  file(RELATIVE_PATH rel "${root}" "${file}")
  get_filename_component(name "${file}" NAME)
  layer_rank("${rel}" file_rank file_layer)
  if(file_rank EQUAL -1)
    report("${file}" 1 "file outside include/halfspin/")
  elseif(file_rank EQUAL -2)
    report("${file}" 1 "unknown layer folder '${file_layer}' (layers: ${layers})")
  endif()

  halfspin_scan_code_lines("${file}" code_lines)
  foreach(entry IN LISTS code_lines)
    string(REGEX MATCH "^([0-9]+):(.*)$" _ "${entry}")
    set(line "${CMAKE_MATCH_1}")
    set(code "${CMAKE_MATCH_2}")

    if(code MATCHES "^[ \t]*#[ \t]*include")
      if(code MATCHES "^[ \t]*#[ \t]*include[ \t]*<([^>]*)>")
        set(header "${CMAKE_MATCH_1}")
        list(FIND allowed_std_headers "${header}" known)
        if(known EQUAL -1)
          report("${file}" ${line} "banned standard header <${header}> (allowed: <cmath> <cstdint> <cstddef> <limits> <type_traits> <array> <complex> <utility>)")
        elseif(header STREQUAL "complex")
          list(FIND complex_headers "${name}" su2)
          if(su2 EQUAL -1)
            report("${file}" ${line} "<complex> is allowed only in the SU(2) / Cayley-Klein headers (${complex_headers})")
          endif()
        endif()
      elseif(code MATCHES "^[ \t]*#[ \t]*include[ \t]*\"([^\"]*)\"")
        set(target "${CMAKE_MATCH_1}")
        if(NOT target MATCHES "^halfspin/" OR target MATCHES "(^|/)\\.\\.?(/|$)")
          report("${file}" ${line} "quoted include \"${target}\" must be a path under halfspin/ (no . or .. parts)")
        else()
          layer_rank("${target}" target_rank target_layer)
          if(target_rank EQUAL -2)
            report("${file}" ${line} "quoted include \"${target}\" names an unknown layer '${target_layer}'")
          elseif(file_rank GREATER_EQUAL 0 AND target_rank GREATER file_rank)
            report("${file}" ${line} "layering violation: ${file_layer} must not include ${target_layer} (\"${target}\")")
          endif()
          if(NOT EXISTS "${root}/${target}")
            report("${file}" ${line} "quoted include \"${target}\" does not exist under ${root}")
          endif()
        endif()
      else()
        report("${file}" ${line} "unrecognized #include directive (only <header> and \"halfspin/...\" are allowed)")
      endif()
      continue()  # the header name itself is not code: <new> is reported above, not twice
    endif()

    halfspin_scan_blank_literals("${code}" bare)
    string(REGEX MATCHALL "${banned_words_regex}" hits "${bare}")
    foreach(hit IN LISTS hits)
      string(REGEX REPLACE "^[^A-Za-z_]*([A-Za-z_]+).*$" "\\1" word "${hit}")
      report("${file}" ${line} "banned word '${word}' (no heap, no exceptions, no RTTI in include/)")
    endforeach()
    if(bare MATCHES "noexcept[ \t]*\\([ \t]*false")
      report("${file}" ${line} "noexcept(false): every function in include/ is noexcept")
    endif()
  endforeach()
endforeach()

if(violations GREATER 0)
  message(FATAL_ERROR "CheckIncludes: ${violations} violation(s) in ${root}")
endif()
message(STATUS "CheckIncludes: ${file_count} file(s) under ${root} obey the include, layering and "
               "no-heap/no-exception/no-RTTI rules")
