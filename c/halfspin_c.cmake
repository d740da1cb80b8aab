# The C interface (halfspin_c.h): one C++ translation unit compiled into a static library,
# halfspin::c, for C firmware and C programs. Included by the top-level CMakeLists.txt (an include,
# not a subdirectory: a project that vendors halfspin with its tests off gets no directory added,
# tests/build_checks/consumer_add_subdirectory). Built by default only with the tests (the demo and
# the examples do not need it); a parent project that links halfspin::c builds it with its own
# toolchain. The installed package builds the same target from the installed source
# (cmake/halfspinConfig.cmake.in).
if(PROJECT_IS_TOP_LEVEL AND HALFSPIN_BUILD_TESTS)
  add_library(halfspin_c STATIC "${CMAKE_CURRENT_LIST_DIR}/halfspin_c.cpp")
else()
  add_library(halfspin_c STATIC EXCLUDE_FROM_ALL "${CMAKE_CURRENT_LIST_DIR}/halfspin_c.cpp")
endif()
add_library(halfspin::c ALIAS halfspin_c)
target_include_directories(halfspin_c PUBLIC $<BUILD_INTERFACE:${CMAKE_CURRENT_LIST_DIR}>)
target_link_libraries(halfspin_c PUBLIC halfspin::halfspin)
set_target_properties(halfspin_c PROPERTIES
  CXX_STANDARD 17 CXX_STANDARD_REQUIRED ON CXX_EXTENSIONS OFF)
# C callers cannot catch an exception and the unit has no RTTI use.
target_compile_options(halfspin_c PRIVATE -fno-exceptions -fno-rtti)
halfspin_target_warnings(halfspin_c)

install(FILES "${CMAKE_CURRENT_LIST_DIR}/halfspin_c.h" DESTINATION "${CMAKE_INSTALL_INCLUDEDIR}")
install(FILES "${CMAKE_CURRENT_LIST_DIR}/halfspin_c.cpp" "${CMAKE_CURRENT_LIST_DIR}/README.md"
  DESTINATION "${HALFSPIN_DATA_DIR}/c")
