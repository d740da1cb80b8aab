# cmake -P script: hygiene of linked target images, from their symbol tables (arm-none-eabi-nm,
# defined symbols only: an undefined weak reference links nothing).
#
# Rules (each image gets the rules of its class; every violating symbol is listed):
#   exceptions  exception machinery: __cxa_throw, __cxa_rethrow, __cxa_allocate_exception,
#               __cxa_begin_catch, __cxa_end_catch, __gxx_personality_*, _Unwind_*,
#               __aeabi_unwind_cpp_pr*, and libstdc++'s throw helpers std::__throw_* (which
#               -fno-exceptions does not remove from library code such as std::array::at).
#   cxx-heap    operator new/new[]/delete/delete[] in every variant (plain, sized, aligned,
#               nothrow): _Znwj _Znaj _ZdlPv _ZdaPv and the longer manglings that start so.
#   c-heap      malloc, free, calloc, realloc, memalign, aligned_alloc, posix_memalign, valloc,
#               pvalloc and newlib's reentrant _malloc_r, _free_r, _calloc_r, _realloc_r,
#               _memalign_r.
#   double      double-precision soft-float helpers (__aeabi_d*, __aeabi_*2d, __adddf3,
#               __subdf3, __muldf3, __divdf3, __negdf2, __extendsfdf2, __truncdfsf2, the
#               comparisons __*df2, __float*df, __fix*df*) and double-precision libm (sin, cos,
#               tan, asin, acos, atan, atan2, sqrt, exp, log, pow, fmod, hypot, floor and their
#               __ieee754_/__kernel_ internals): a float image that links one of these computes
#               something in double, i.e. a float→double promotion slipped in.
#
# Image classes in a target build directory:
#   footprint/footprint_*_float_*.elf   exceptions, cxx-heap, c-heap, double
#   footprint/footprint_*_double_*.elf  exceptions, cxx-heap, c-heap
#   every other *.elf (the on-target tests, the firmware example, the replay images)
#                                       exceptions, cxx-heap
#   The heap check on malloc/free cannot apply to those: they print through newlib's stdio, and
#   the board's startup file opens the semihosting console and leaves through exit(), both of
#   which link newlib's malloc/free (and printf's %f links double helpers), whatever halfspin
#   does. The footprint images use a minimal startup (footprint/minimal_startup.c) and no printf,
#   so every rule is meaningful on them.
#   hygiene-fixtures/ holds images that break a rule on purpose; a directory scan skips it.
#
# Usage:
#   cmake -DBINARY_DIR=<target build dir> [-DNM=<arm-none-eabi-nm>] -P check_hygiene.cmake
#       scans every *.elf under BINARY_DIR; fails if an image breaks a rule, if an image of the
#       footprint manifest is missing, or if the on-target test image is missing.
#   cmake -DIMAGE=<file.elf> -DRULES=<rule,rule...> [-DNM=...] -P check_hygiene.cmake
#       checks one image with the given rules (comma-separated: a ';' does not survive being
#       passed on a command line through ctest and execute_process intact).
# Output: one line per image ("ok <image> [rules]" or "VIOLATION <image>: <rule>: <symbols>").

cmake_minimum_required(VERSION 3.25)

if(NOT NM)
  find_program(NM arm-none-eabi-nm)
endif()
if(NOT NM)
  message(FATAL_ERROR "arm-none-eabi-nm not found (Debian package binutils-arm-none-eabi)")
endif()

set(rule_exceptions
  "^(__cxa_throw|__cxa_rethrow|__cxa_allocate_exception|__cxa_free_exception|__cxa_begin_catch|__cxa_end_catch|__cxa_call_unexpected)$"
  "^__gxx_personality_"
  "^_Unwind_"
  "^__aeabi_unwind_cpp_pr"
  "^_ZSt[0-9]+__throw_")
set(rule_cxx-heap
  "^_Zn[wa][jm]"
  "^_Zd[la]Pv")
set(rule_c-heap
  "^_?(malloc|free|calloc|realloc|memalign|aligned_alloc|posix_memalign|valloc|pvalloc)$"
  "^_(malloc|free|calloc|realloc|memalign)_r$")
set(rule_double
  "^__aeabi_d"
  "^__aeabi_[a-z0-9]+2d$"
  "^__(add|sub|mul|div)df3$"
  "^__negdf2$"
  "^__extendsfdf2$"
  "^__truncdfsf2$"
  "^__(eq|ne|lt|le|gt|ge|un|cmp)df2$"
  "^__float(un)?[sdt]idf$"
  "^__fix(uns)?df[sdt]i$"
  "^(__ieee754_|__kernel_)?(sin|cos|tan|asin|acos|atan|atan2|sqrt|exp|log|pow|fmod|hypot|floor|rem_pio2)$")

# Sets ${out} to "" or to "rule: sym sym ...; rule: ..." for the rules the image breaks.
function(check_image image rules out)
  execute_process(COMMAND "${NM}" --defined-only "${image}"
    OUTPUT_VARIABLE symbols ERROR_VARIABLE nm_error RESULT_VARIABLE nm_result)
  if(NOT nm_result EQUAL 0)
    message(FATAL_ERROR "${NM} failed on ${image}: ${nm_error}")
  endif()
  string(REPLACE "\n" ";" lines "${symbols}")
  set(names "")
  foreach(line IN LISTS lines)
    # "<address> <type> <name>"
    if(line MATCHES "^[0-9a-fA-F]+ [A-Za-z] (.+)$")
      list(APPEND names "${CMAKE_MATCH_1}")
    endif()
  endforeach()
  list(LENGTH names count)
  if(count EQUAL 0)
    message(FATAL_ERROR "no symbols read from ${image}: cannot check it (stripped image?)")
  endif()
  set(report "")
  foreach(rule IN LISTS rules)
    if(NOT DEFINED rule_${rule})
      message(FATAL_ERROR "unknown hygiene rule '${rule}'")
    endif()
    set(hits "")
    foreach(name IN LISTS names)
      foreach(pattern IN LISTS rule_${rule})
        if(name MATCHES "${pattern}")
          list(APPEND hits "${name}")
          break()
        endif()
      endforeach()
    endforeach()
    if(hits)
      list(REMOVE_DUPLICATES hits)
      list(JOIN hits " " hit_text)
      string(APPEND report "${rule}: ${hit_text}; ")
    endif()
  endforeach()
  set(${out} "${report}" PARENT_SCOPE)
endfunction()

if(IMAGE)
  if(NOT EXISTS "${IMAGE}")
    message(FATAL_ERROR "no image ${IMAGE}")
  endif()
  if(NOT RULES)
    message(FATAL_ERROR "IMAGE needs RULES")
  endif()
  string(REPLACE "," ";" RULES "${RULES}")
  check_image("${IMAGE}" "${RULES}" report)
  if(report)
    message("VIOLATION ${IMAGE}: ${report}")
    message(FATAL_ERROR "hygiene check failed")
  endif()
  message("ok ${IMAGE} [${RULES}]")
  return()
endif()

if(NOT BINARY_DIR OR NOT IS_DIRECTORY "${BINARY_DIR}")
  message(FATAL_ERROR "BINARY_DIR '${BINARY_DIR}' is not a directory")
endif()

# The images the build must have produced: the footprint manifest and the on-target tests.
set(failures "")
set(manifest "${BINARY_DIR}/footprint/manifest.txt")
if(NOT EXISTS "${manifest}")
  message(FATAL_ERROR "no footprint manifest ${manifest}: the footprint images were not built")
endif()
file(STRINGS "${manifest}" manifest_lines)
set(expected "${BINARY_DIR}/halfspin_target_tests.elf")
foreach(line IN LISTS manifest_lines)
  string(REGEX MATCH "^[^ ]+" image_name "${line}")
  list(APPEND expected "${BINARY_DIR}/footprint/${image_name}.elf")
endforeach()
foreach(file IN LISTS expected)
  if(NOT EXISTS "${file}")
    list(APPEND failures "missing image ${file}")
  endif()
endforeach()

file(GLOB_RECURSE images LIST_DIRECTORIES false "${BINARY_DIR}/*.elf")
set(checked 0)
set(checked_footprint 0)
foreach(image IN LISTS images)
  file(RELATIVE_PATH relative "${BINARY_DIR}" "${image}")
  if(relative MATCHES "^hygiene-fixtures/" OR relative MATCHES "(^|/)CMakeFiles/")
    continue()
  endif()
  if(relative MATCHES "^footprint/footprint_[^/]*_float_[^/]*\\.elf$")
    set(rules exceptions cxx-heap c-heap double)
    math(EXPR checked_footprint "${checked_footprint} + 1")
  elseif(relative MATCHES "^footprint/footprint_[^/]*\\.elf$")
    set(rules exceptions cxx-heap c-heap)
    math(EXPR checked_footprint "${checked_footprint} + 1")
  else()
    set(rules exceptions cxx-heap)
  endif()
  check_image("${image}" "${rules}" report)
  if(report)
    list(APPEND failures "VIOLATION ${relative}: ${report}")
    message("VIOLATION ${relative}: ${report}")
  else()
    message("ok ${relative} [${rules}]")
  endif()
  math(EXPR checked "${checked} + 1")
endforeach()

list(LENGTH manifest_lines manifest_count)
if(checked_footprint LESS manifest_count)
  list(APPEND failures
    "checked ${checked_footprint} footprint images, the manifest lists ${manifest_count}")
endif()
message("checked ${checked} images (${checked_footprint} footprint images)")
if(failures)
  list(JOIN failures "\n  " failure_text)
  message(FATAL_ERROR "hygiene check failed:\n  ${failure_text}")
endif()
