# Runs the command lines a document gives a newcomer, exactly as written, in a scratch directory
# (ctest label consumer; see CMakeLists.txt beside this file).
#   cmake -DDOC=<file.md> -DCOMMANDS=<block> -DWORK=<dir> [-DSOURCE_DIR=<tree> -DCOPY_SOURCE=<name>]
#         [-DWRITE=<path=block;...>] [-DEXPECT=<regex>] -P run_doc_commands.cmake
# COPY_SOURCE copies the source tree (without build/ and .git/) to WORK/<name>: the newcomer's
# clone (WORK is emptied first). WRITE writes fenced blocks of DOC (marked `<!-- consumer: block -->`) to files under WORK.
# The COMMANDS block runs under `sh -e -x` in WORK with HOME=WORK/home, so `$HOME/...` paths in the
# document stay inside the scratch directory; EXPECT must match the combined output.
include("${CMAKE_CURRENT_LIST_DIR}/doc_blocks.cmake")
foreach(var DOC COMMANDS WORK)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "run_doc_commands.cmake: ${var} is not set")
  endif()
endforeach()
if(COPY_SOURCE)  # the first step of a path: a fresh scratch directory
  file(REMOVE_RECURSE "${WORK}")
endif()
file(MAKE_DIRECTORY "${WORK}/home")
if(COPY_SOURCE)
  file(COPY "${SOURCE_DIR}/" DESTINATION "${WORK}/${COPY_SOURCE}"
       REGEX "^${SOURCE_DIR}/(build|\\.git|Testing)$" EXCLUDE)
endif()
foreach(item IN LISTS WRITE)
  string(REGEX MATCH "^([^=]+)=(.+)$" _ "${item}")
  set(path "${CMAKE_MATCH_1}")
  doc_block("${DOC}" "${CMAKE_MATCH_2}" content)
  file(WRITE "${WORK}/${path}" "${content}")
endforeach()
doc_block("${DOC}" "${COMMANDS}" commands)
message(STATUS "From ${DOC} (block '${COMMANDS}'):\n${commands}")
execute_process(COMMAND "${CMAKE_COMMAND}" -E env "HOME=${WORK}/home" sh -e -x -c "${commands}"
                WORKING_DIRECTORY "${WORK}" RESULT_VARIABLE rc
                OUTPUT_VARIABLE out ERROR_VARIABLE out)
message(STATUS "Output:\n${out}")
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "the commands of block '${COMMANDS}' in ${DOC} failed (${rc})")
endif()
if(DEFINED EXPECT AND NOT out MATCHES "${EXPECT}")
  message(FATAL_ERROR "the output of block '${COMMANDS}' does not match '${EXPECT}'")
endif()
