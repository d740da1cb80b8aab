# Board support for the Arm MPS2 boards as emulated by qemu-system-arm (mps2-an386: Cortex-M4F,
# mps2-an385: Cortex-M3). Use with the toolchain file cmake/arm-none-eabi.cmake.
#   halfspin_add_mps2_executable(<name> <sources>...) → <name>.elf with a vector table, a reset
#   handler (FPU on, .bss zeroed, constructors run), the semihosting console (printf, exit code).
# Installed with the package as share/halfspin/boards/mps2/ (docs/cross-compiling.md): a consumer
# gets it with find_package(halfspin ... COMPONENTS mps2).
set(HALFSPIN_MPS2_DIR "${CMAKE_CURRENT_LIST_DIR}")

# The qemu machine name for a HALFSPIN_TARGET_CPU value.
function(halfspin_mps2_machine cpu out)
  if(cpu STREQUAL "cortex-m4f")
    set(${out} "mps2-an386" PARENT_SCOPE)
  elseif(cpu STREQUAL "cortex-m3")
    set(${out} "mps2-an385" PARENT_SCOPE)
  else()
    message(FATAL_ERROR "no MPS2 board for CPU '${cpu}'")
  endif()
endfunction()

# The startup file is C: the calling project must enable C (project(<name> C CXX)) before calling
# this. It is compiled in an object library of its own, with the board's C warning set and
# without the directory's compile options, so that a consumer's add_compile_options(-Wall -Werror
# -Wold-style-cast ...) for its C++ does not reach it (CMAKE_C_FLAGS, the consumer's own C flags,
# still do). The link uses rdimon.specs (newlib's system calls over semihosting: printf to qemu's
# console, exit status to qemu's exit code) and -nostartfiles (startup.c is the startup code).
function(halfspin_add_mps2_executable name)
  get_property(languages GLOBAL PROPERTY ENABLED_LANGUAGES)
  if(NOT "C" IN_LIST languages)
    message(FATAL_ERROR
      "halfspin_add_mps2_executable(${name}): the board's startup file is C, and C is not "
      "enabled in this project; declare project(<name> C CXX) or call enable_language(C) "
      "before it (enabled: ${languages}).")
  endif()
  # The function's own directory, not HALFSPIN_MPS2_DIR: a variable of the scope that included
  # this file, which a caller in another directory does not see.
  set(board_dir "${CMAKE_CURRENT_FUNCTION_LIST_DIR}")
  add_library(${name}_mps2_startup OBJECT "${board_dir}/startup.c")
  set_property(TARGET ${name}_mps2_startup PROPERTY COMPILE_OPTIONS
    -Wall -Wextra -Wpedantic -Wconversion -Wshadow -Wstrict-prototypes -Wmissing-prototypes)
  set_target_properties(${name}_mps2_startup PROPERTIES C_STANDARD 11 C_STANDARD_REQUIRED ON)

  add_executable(${name} ${ARGN})
  set_target_properties(${name} PROPERTIES SUFFIX ".elf")
  target_sources(${name} PRIVATE $<TARGET_OBJECTS:${name}_mps2_startup>)
  target_link_libraries(${name} PRIVATE halfspin::halfspin)
  target_link_options(${name} PRIVATE
    "-T${board_dir}/mps2.ld" --specs=rdimon.specs -nostartfiles
    "-Wl,-Map=$<TARGET_FILE_DIR:${name}>/${name}.map")
  set_target_properties(${name} PROPERTIES LINK_DEPENDS "${board_dir}/mps2.ld")
endfunction()
