# cmake -DMODE=<find_package|add_subdirectory> -DSOURCE_DIR=<halfspin source> -DBINARY_DIR=<its
#       build tree> -DCONSUMER_DIR=<consumer project> -DWORK_DIR=<scratch dir under the build tree>
#       -DCXX_COMPILER=<path> -DGENERATOR=<name> [-DMAKE_PROGRAM=<path>] [-DCONFIG=<cfg>]
#       [-DREQUEST_VERSION=<x.y>] [-DEXPECTED_VERSION=<x.y.z>] -P Consumer.cmake
#
# find_package: installs the build tree with `cmake --install` into <WORK_DIR>/prefix, checks that
#   every header of include/ was installed, then configures the consumer with CMAKE_PREFIX_PATH at
#   that prefix (the consumer checks the version file itself), builds it with the embedded flag
#   set and -Werror, checks that the installed headers were not passed as system headers (which
#   would hide their warnings), and runs the consumer's tests.
# add_subdirectory: configures the consumer on the source tree, builds it and runs its tests.
# Every step starts from an empty <WORK_DIR>, so no cache of an earlier run can hide a problem.

cmake_minimum_required(VERSION 3.20)
foreach(var MODE SOURCE_DIR BINARY_DIR CONSUMER_DIR WORK_DIR CXX_COMPILER GENERATOR)
  if(NOT DEFINED ${var} OR "${${var}}" STREQUAL "")
    message(FATAL_ERROR "Consumer: pass -D${var}=...")
  endif()
endforeach()
if(NOT DEFINED CONFIG OR CONFIG STREQUAL "")
  set(CONFIG Release)
endif()

function(run what)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE status OUTPUT_VARIABLE out ERROR_VARIABLE err)
  message("---- ${what} ----\n${out}${err}")
  if(NOT status EQUAL 0)
    message(FATAL_ERROR "Consumer (${MODE}): ${what} failed (status ${status})")
  endif()
  set(run_output "${out}${err}" PARENT_SCOPE)
endfunction()

file(REMOVE_RECURSE "${WORK_DIR}")
file(MAKE_DIRECTORY "${WORK_DIR}")
set(prefix "${WORK_DIR}/prefix")
set(consumer_build "${WORK_DIR}/build")

set(configure_args
  -S "${CONSUMER_DIR}" -B "${consumer_build}" -G "${GENERATOR}"
  "-DCMAKE_CXX_COMPILER=${CXX_COMPILER}"
  "-DCMAKE_BUILD_TYPE=${CONFIG}")
if(DEFINED MAKE_PROGRAM AND NOT MAKE_PROGRAM STREQUAL "")
  list(APPEND configure_args "-DCMAKE_MAKE_PROGRAM=${MAKE_PROGRAM}")
endif()

if(MODE STREQUAL "find_package")
  run("cmake --install ${BINARY_DIR}"
    "${CMAKE_COMMAND}" --install "${BINARY_DIR}" --prefix "${prefix}" --config "${CONFIG}")
  file(GLOB_RECURSE source_headers LIST_DIRECTORIES false RELATIVE "${SOURCE_DIR}/include"
    "${SOURCE_DIR}/include/*")
  set(missing "")
  foreach(header IN LISTS source_headers)
    if(NOT EXISTS "${prefix}/include/${header}")
      string(APPEND missing " ${header}")
    endif()
  endforeach()
  if(NOT missing STREQUAL "")
    message(FATAL_ERROR "Consumer: not installed under ${prefix}/include:${missing}")
  endif()
  # Only find_package reads these (the add_subdirectory consumer would warn that they are unused).
  list(APPEND configure_args
    -DCMAKE_FIND_USE_PACKAGE_REGISTRY=OFF
    -DCMAKE_FIND_USE_SYSTEM_PACKAGE_REGISTRY=OFF
    "-DCMAKE_PREFIX_PATH=${prefix}"
    "-DHALFSPIN_EXPECTED_PREFIX=${prefix}")
  if(DEFINED REQUEST_VERSION AND NOT REQUEST_VERSION STREQUAL "")
    list(APPEND configure_args "-DHALFSPIN_REQUEST_VERSION=${REQUEST_VERSION}")
  endif()
  if(DEFINED EXPECTED_VERSION AND NOT EXPECTED_VERSION STREQUAL "")
    list(APPEND configure_args "-DHALFSPIN_EXPECTED_VERSION=${EXPECTED_VERSION}")
  endif()
elseif(MODE STREQUAL "add_subdirectory")
  list(APPEND configure_args "-DHALFSPIN_SOURCE_DIR=${SOURCE_DIR}")
else()
  message(FATAL_ERROR "Consumer: MODE must be find_package or add_subdirectory, not '${MODE}'")
endif()

run("configure the consumer" "${CMAKE_COMMAND}" ${configure_args})
run("build the consumer"
  "${CMAKE_COMMAND}" --build "${consumer_build}" --config "${CONFIG}" --verbose)
if(MODE STREQUAL "find_package")
  foreach(form "-isystem ${prefix}/include" "-isystem${prefix}/include")
    string(FIND "${run_output}" "${form}" at)
    if(NOT at EQUAL -1)
      message(FATAL_ERROR "Consumer: the installed headers were compiled as system headers "
                          "(${form}), so their warnings were not checked")
    endif()
  endforeach()
  string(FIND "${run_output}" "-I${prefix}/include" at)
  if(at EQUAL -1)
    message(FATAL_ERROR "Consumer: the compile line does not name -I${prefix}/include")
  endif()
endif()
get_filename_component(cmake_bin_dir "${CMAKE_COMMAND}" DIRECTORY)
find_program(ctest_command ctest HINTS "${cmake_bin_dir}" NO_DEFAULT_PATH)
if(NOT ctest_command)
  find_program(ctest_command ctest REQUIRED)
endif()
run("run the consumer's tests"
  "${CMAKE_COMMAND}" -E chdir "${consumer_build}"
  "${ctest_command}" --output-on-failure -C "${CONFIG}")
# Two tests of the C++ library, two of the C interface (halfspin::c).
string(REGEX MATCH "100% tests passed, 0 tests failed out of ([0-9]+)" _ "${run_output}")
if(NOT CMAKE_MATCH_1 EQUAL 4)
  message(FATAL_ERROR "Consumer: expected the consumer's 4 tests to pass")
endif()
message(STATUS "Consumer (${MODE}): built with the embedded flag set and -Werror, and ran correctly")
