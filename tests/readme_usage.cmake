# The README's Usage block is a complete program: extracted from README.md at configure time
# (re-run when README.md changes), built against the library with the project's warnings, and run;
# the test passes when it prints what the README says it prints. Test: readme.usage (label
# consumer).
set(readme "${PROJECT_SOURCE_DIR}/README.md")
set_property(DIRECTORY APPEND PROPERTY CMAKE_CONFIGURE_DEPENDS "${readme}")
file(READ "${readme}" readme_text)
string(FIND "${readme_text}" "## Usage" usage_at)
if(usage_at EQUAL -1)
  message(FATAL_ERROR "README.md has no '## Usage' section")
endif()
string(SUBSTRING "${readme_text}" ${usage_at} -1 usage_text)
string(FIND "${usage_text}" "```cpp\n" block_at)
string(FIND "${usage_text}" "\n```\n" block_end)
if(block_at EQUAL -1 OR block_end EQUAL -1 OR block_end LESS block_at)
  message(FATAL_ERROR "README.md's Usage section has no ```cpp block")
endif()
math(EXPR code_at "${block_at} + 7")
math(EXPR code_length "${block_end} - ${code_at} + 1")
string(SUBSTRING "${usage_text}" ${code_at} ${code_length} usage_code)
file(WRITE "${CMAKE_CURRENT_BINARY_DIR}/readme_usage.cpp" "${usage_code}")

add_executable(readme_usage "${CMAKE_CURRENT_BINARY_DIR}/readme_usage.cpp")
target_link_libraries(readme_usage PRIVATE halfspin::halfspin)
halfspin_target_warnings(readme_usage)
add_test(NAME readme.usage COMMAND readme_usage)
set_tests_properties(readme.usage PROPERTIES LABELS consumer
  PASS_REGULAR_EXPRESSION "^yaw 0\\.0000 pitch 0\\.0000 roll 1\\.0000 rad\n$")
