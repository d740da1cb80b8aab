# The C interface test program's flags, shared by the host sub-builds (CMakeLists.txt beside this
# file) and the Cortex-M image (tests/target/c_interface.cmake): the C file as strict C99 with
# -Wall -Wextra -Werror -pedantic (set on the file, so that other C sources of an image, such as
# the board's startup code, keep their own), the C++ reference with the project's warning set.
set(HALFSPIN_C_INTERFACE_TEST_DIR "${CMAKE_CURRENT_LIST_DIR}")

# halfspin_add_c_interface_test(<target> [<library>]): the test program in <target>, linked with
# halfspin::c or <library> (a build of c/halfspin_c.cpp with a selection).
function(halfspin_add_c_interface_test target)
  set(library halfspin::c)
  if(ARGC GREATER 1)
    set(library "${ARGV1}")
  endif()
  target_sources(${target} PRIVATE
    "${HALFSPIN_C_INTERFACE_TEST_DIR}/test_c_interface.c"
    "${HALFSPIN_C_INTERFACE_TEST_DIR}/c_reference.cpp")
  set_source_files_properties("${HALFSPIN_C_INTERFACE_TEST_DIR}/test_c_interface.c"
    TARGET_DIRECTORY ${target}
    PROPERTIES COMPILE_OPTIONS "-std=c99;-Wall;-Wextra;-Werror;-pedantic")
  target_include_directories(${target} PRIVATE "${HALFSPIN_C_INTERFACE_TEST_DIR}")
  target_link_libraries(${target} PRIVATE ${library})
  halfspin_target_warnings(${target})
endfunction()
