# Runs the command lines a document gives a newcomer, exactly as written, in a scratch directory
# (ctest label consumer; see CMakeLists.txt beside this file).
#   cmake -DDOC=<file.md> -DCOMMANDS=<block> -DWORK=<dir> [-DSOURCE_DIR=<tree> -DCOPY_SOURCE=<name>]
#         [-DWRITE=<path=block;...>] [-DEXPECT=<regex;...>] [-DTOOL_DIRS=<dir;...>]
#         -P run_doc_commands.cmake
# COPY_SOURCE starts a path: WORK is emptied and the source tree (without build/ and .git/) copied
# to WORK/<name>, the newcomer's clone. WRITE writes fenced blocks of DOC (marked
# `<!-- consumer: block -->`) to files under WORK. The COMMANDS block runs under `sh -e -x` in WORK
# with HOME=WORK/home, so `$HOME/...` paths in the document stay inside the scratch directory, and
# with TOOL_DIRS first on PATH (the cmake running this script, so the block's `cmake` is the same;
# the cross compiler and qemu the build found). It passes when every command succeeds, the
# combined output matches every regular expression of EXPECT and holds no "warning:" and no
# "CMake Warning" (no build may print one).
include("${CMAKE_CURRENT_LIST_DIR}/doc_blocks.cmake")
foreach(var DOC COMMANDS WORK)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "run_doc_commands.cmake: ${var} is not set")
  endif()
endforeach()
if(COPY_SOURCE)
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
set(path "$ENV{PATH}")
foreach(dir IN LISTS TOOL_DIRS)
  if(NOT dir STREQUAL "")  # an empty PATH entry would mean the working directory
    set(path "${dir}:${path}")
  endif()
endforeach()
doc_block("${DOC}" "${COMMANDS}" commands)
message(STATUS "From ${DOC} (block '${COMMANDS}'):\n${commands}")
execute_process(
  COMMAND "${CMAKE_COMMAND}" -E env "HOME=${WORK}/home" "PATH=${path}" sh -e -x -c "${commands}"
  WORKING_DIRECTORY "${WORK}" RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE out)
message(STATUS "Output:\n${out}")
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "the commands of block '${COMMANDS}' in ${DOC} failed (${rc})")
endif()
foreach(pattern IN LISTS EXPECT)
  if(NOT out MATCHES "${pattern}")
    message(FATAL_ERROR "the output of block '${COMMANDS}' does not match '${pattern}'")
  endif()
endforeach()
foreach(warning "warning:" "CMake Warning")
  string(FIND "${out}" "${warning}" at)
  if(NOT at EQUAL -1)
    message(FATAL_ERROR "the commands of block '${COMMANDS}' printed '${warning}'")
  endif()
endforeach()
