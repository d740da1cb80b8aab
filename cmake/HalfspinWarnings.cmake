# The warning set every target of the project builds with (the check preset makes them errors).
set(HALFSPIN_WARNING_FLAGS
  -Wall -Wextra -Wpedantic -Wconversion -Wsign-conversion -Wshadow -Wdouble-promotion
  -Wold-style-cast)

# C++ only: targets that also compile C (the board startup code) keep the compiler's C defaults.
function(halfspin_target_warnings target)
  target_compile_options(${target} PRIVATE $<$<COMPILE_LANGUAGE:CXX>:${HALFSPIN_WARNING_FLAGS}>)
  if(HALFSPIN_WARNINGS_AS_ERRORS)
    target_compile_options(${target} PRIVATE $<$<COMPILE_LANGUAGE:CXX>:-Werror>)
  endif()
endfunction()
