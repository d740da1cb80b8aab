# Board support for the Arm MPS2 boards as emulated by qemu-system-arm (mps2-an386: Cortex-M4F,
# mps2-an385: Cortex-M3). Use with the toolchain file cmake/arm-none-eabi.cmake.
#   halfspin_add_mps2_executable(<name> <sources>...) → <name>.elf with a vector table, a reset
#   handler (FPU on, .bss zeroed, constructors run), the semihosting console (printf, exit code).
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

function(halfspin_add_mps2_executable name)
  add_executable(${name} ${ARGN} "${HALFSPIN_MPS2_DIR}/startup.c")
  set_target_properties(${name} PROPERTIES SUFFIX ".elf")
  target_link_libraries(${name} PRIVATE halfspin::halfspin)
  target_link_options(${name} PRIVATE
    "-T${HALFSPIN_MPS2_DIR}/mps2.ld" --specs=rdimon.specs -nostartfiles
    "-Wl,-Map=$<TARGET_FILE_DIR:${name}>/${name}.map")
  set_target_properties(${name} PROPERTIES LINK_DEPENDS "${HALFSPIN_MPS2_DIR}/mps2.ld")
endfunction()
