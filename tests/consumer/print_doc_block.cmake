# Prints a marked block of a Markdown file (doc_blocks.cmake), for scripts that run a document's
# commands as written: cmake -DDOC=README.md -DNAME=demo -P print_doc_block.cmake
include("${CMAKE_CURRENT_LIST_DIR}/doc_blocks.cmake")
doc_block("${DOC}" "${NAME}" block)
execute_process(COMMAND "${CMAKE_COMMAND}" -E echo_append "${block}")
