# Shared by the cmake -P checkers: reads a C++ source file into a list of lines with comments
# removed, so that a word inside a comment (// may throw ...) is never taken for code.
#
# CMake lists split on ';' and treat '[', ']' and '\' specially, so those characters are replaced
# by control characters before the file is split into lines (a line ending in '\' or holding an
# unbalanced '[' would otherwise swallow the next line). The checkers only look for words and
# #include directives, which never contain them.
#
# Known limits (neither occurs in this library): '\' line continuations of // comments are not
# understood (only a false alarm can follow), nor are raw string literals R"(...)" (a multi-line
# one holding /* could hide the code after it).

string(ASCII 1 HALFSPIN_SCAN_BACKSLASH)
string(ASCII 2 HALFSPIN_SCAN_LBRACKET)
string(ASCII 3 HALFSPIN_SCAN_RBRACKET)
string(ASCII 4 HALFSPIN_SCAN_SEMICOLON)

# halfspin_scan_code_lines(<file> <out-var>): <out-var> receives one list element "<N>:<code>" per
# source line N (counted from 1) that holds any code, with comments replaced by a space. String
# and character literals are kept as they are. (Empty lines are left out because list(APPEND) of
# an empty string to an empty list adds no element, which would shift every later line number.)
function(halfspin_scan_code_lines file out_var)
  set(BS "${HALFSPIN_SCAN_BACKSLASH}")
  file(READ "${file}" content)
  string(REPLACE "\r" "" content "${content}")
  string(REPLACE "\\" "${BS}" content "${content}")
  string(REPLACE "[" "${HALFSPIN_SCAN_LBRACKET}" content "${content}")
  string(REPLACE "]" "${HALFSPIN_SCAN_RBRACKET}" content "${content}")
  string(REPLACE ";" "${HALFSPIN_SCAN_SEMICOLON}" content "${content}")
  string(REPLACE "\n" ";" lines "${content}")

  set(result "")
  set(in_block FALSE)
  set(number 0)
  foreach(line IN LISTS lines)
    math(EXPR number "${number} + 1")
    set(code "")
    set(rest "${line}")
    while(NOT rest STREQUAL "")
      if(in_block)
        string(FIND "${rest}" "*/" pos)
        if(pos EQUAL -1)
          set(rest "")
          break()
        endif()
        math(EXPR pos "${pos} + 2")
        string(SUBSTRING "${rest}" ${pos} -1 rest)
        string(APPEND code " ")
        set(in_block FALSE)
        continue()
      endif()
      # Plain code up to the next character that may open a comment or a literal.
      string(REGEX MATCH "^[^/\"']+" plain "${rest}")
      string(APPEND code "${plain}")
      string(LENGTH "${plain}" n)
      string(SUBSTRING "${rest}" ${n} -1 rest)
      if(rest STREQUAL "")
        break()
      endif()
      string(SUBSTRING "${rest}" 0 2 two)
      string(SUBSTRING "${rest}" 0 1 one)
      if(two STREQUAL "//")
        set(rest "")
        break()
      elseif(two STREQUAL "/*")
        string(SUBSTRING "${rest}" 2 -1 rest)
        string(APPEND code " ")
        set(in_block TRUE)
      elseif(one STREQUAL "/")
        string(APPEND code "/")
        string(SUBSTRING "${rest}" 1 -1 rest)
      elseif(one STREQUAL "\"")
        string(REGEX MATCH "^\"([^\"${BS}]|${BS}.)*\"" literal "${rest}")
        if(literal STREQUAL "")
          set(literal "${rest}")  # unterminated: keep the rest of the line as is
        endif()
        string(APPEND code "${literal}")
        string(LENGTH "${literal}" n)
        string(SUBSTRING "${rest}" ${n} -1 rest)
      else()  # a quote: a digit separator inside a number (1'000), or a character literal
        if(code MATCHES "(^|[^A-Za-z0-9_])[0-9][0-9A-Za-z_.']*$")
          set(literal "'")
        else()
          string(REGEX MATCH "^'([^'${BS}]|${BS}.)*'" literal "${rest}")
          if(literal STREQUAL "")
            set(literal "${rest}")
          endif()
        endif()
        string(APPEND code "${literal}")
        string(LENGTH "${literal}" n)
        string(SUBSTRING "${rest}" ${n} -1 rest)
      endif()
    endwhile()
    if(code MATCHES "[^ \t]")
      list(APPEND result "${number}:${code}")
    endif()
  endforeach()
  set(${out_var} "${result}" PARENT_SCOPE)
endfunction()

# halfspin_scan_blank_literals(<code-line> <out-var>): the line with the contents of string and
# character literals removed, so that "try again" in a literal is not taken for the keyword.
function(halfspin_scan_blank_literals code out_var)
  set(BS "${HALFSPIN_SCAN_BACKSLASH}")
  string(REGEX REPLACE "\"([^\"${BS}]|${BS}.)*\"" "\"\"" code "${code}")
  string(REGEX REPLACE "'([^'${BS}]|${BS}.)+'" "''" code "${code}")
  set(${out_var} "${code}" PARENT_SCOPE)
endfunction()
