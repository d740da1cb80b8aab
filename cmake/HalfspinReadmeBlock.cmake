# halfspin_readme_block(<markdown file> <heading> <fence language> <output file>): writes the first
# fenced block of <fence language> after <heading> (say "## Usage" and cpp) to <output file>, at
# configure time; the build configures again when the markdown file changes. A missing heading or
# block fails the configuration. For documentation whose examples are complete programs that the
# tests build and run (README.md's Usage block, c/README.md's Example).
function(halfspin_readme_block readme heading language output)
  set_property(DIRECTORY APPEND PROPERTY CMAKE_CONFIGURE_DEPENDS "${readme}")
  file(READ "${readme}" text)
  string(FIND "${text}" "${heading}" heading_at)
  if(heading_at EQUAL -1)
    message(FATAL_ERROR "${readme} has no '${heading}' section")
  endif()
  string(SUBSTRING "${text}" ${heading_at} -1 section)
  set(fence "```${language}\n")
  string(FIND "${section}" "${fence}" block_at)
  string(FIND "${section}" "\n```\n" block_end)
  if(block_at EQUAL -1 OR block_end EQUAL -1 OR block_end LESS block_at)
    message(FATAL_ERROR "${readme}: the '${heading}' section has no ```${language} block")
  endif()
  string(LENGTH "${fence}" fence_length)
  math(EXPR code_at "${block_at} + ${fence_length}")
  math(EXPR code_length "${block_end} - ${code_at} + 1")
  string(SUBSTRING "${section}" ${code_at} ${code_length} code)
  file(WRITE "${output}" "${code}")
endfunction()
