# Included by both consumer projects (consumer_find_package, consumer_add_subdirectory): a strict
# C99 program (consumer_find_package/main.c) against halfspin::c, and its two tests (the second
# must fail: the check can fail).
add_executable(halfspin_c_consumer "${CMAKE_CURRENT_LIST_DIR}/consumer_find_package/main.c")
target_link_libraries(halfspin_c_consumer PRIVATE halfspin::c)
set_target_properties(halfspin_c_consumer PROPERTIES
  C_STANDARD 99 C_STANDARD_REQUIRED ON C_EXTENSIONS OFF NO_SYSTEM_FROM_IMPORTED ON)
target_compile_options(halfspin_c_consumer PRIVATE -Wall -Wextra -Werror -pedantic)
if(UNIX)
  target_link_libraries(halfspin_c_consumer PRIVATE m)
endif()
add_test(NAME c_consumer_rotates_correctly COMMAND halfspin_c_consumer)
add_test(NAME c_consumer_detects_wrong_result COMMAND halfspin_c_consumer --expect-opposite-sense)
set_tests_properties(c_consumer_detects_wrong_result PROPERTIES WILL_FAIL TRUE)
