# The README's Usage block is a complete program: extracted from README.md at configure time
# (re-run when README.md changes), built against the library with the project's warnings, and run;
# the test passes when it prints what the README says it prints. Test: readme.usage (label
# consumer).
include("${PROJECT_SOURCE_DIR}/cmake/HalfspinReadmeBlock.cmake")
halfspin_readme_block("${PROJECT_SOURCE_DIR}/README.md" "## Usage" cpp
  "${CMAKE_CURRENT_BINARY_DIR}/readme_usage.cpp")

add_executable(readme_usage "${CMAKE_CURRENT_BINARY_DIR}/readme_usage.cpp")
target_link_libraries(readme_usage PRIVATE halfspin::halfspin)
halfspin_target_warnings(readme_usage)
add_test(NAME readme.usage COMMAND readme_usage)
set_tests_properties(readme.usage PROPERTIES LABELS consumer
  PASS_REGULAR_EXPRESSION "^yaw 0\\.0000 pitch 0\\.0000 roll 1\\.0000 rad\n$")
