# Toolchain file for bare-metal Arm Cortex-M with Debian's gcc-arm-none-eabi and newlib.
#   cmake -S . -B build/m4f --toolchain cmake/arm-none-eabi.cmake -DHALFSPIN_TARGET_CPU=cortex-m4f
# HALFSPIN_TARGET_CPU: cortex-m4f (hard float, single-precision FPU) or cortex-m3 (soft float).
# Floating-point contraction is off so that the target computes exactly what the host computes
# (bit-exact replay): a fused multiply-add rounds once where a*b+c rounds twice.
set(CMAKE_SYSTEM_NAME Generic)
set(CMAKE_SYSTEM_PROCESSOR arm)
set(CMAKE_C_COMPILER arm-none-eabi-gcc)
set(CMAKE_CXX_COMPILER arm-none-eabi-g++)
set(CMAKE_ASM_COMPILER arm-none-eabi-gcc)
set(CMAKE_TRY_COMPILE_TARGET_TYPE STATIC_LIBRARY)
set(CMAKE_FIND_ROOT_PATH_MODE_PROGRAM NEVER)
set(CMAKE_FIND_ROOT_PATH_MODE_LIBRARY ONLY)
set(CMAKE_FIND_ROOT_PATH_MODE_INCLUDE ONLY)

set(HALFSPIN_TARGET_CPU "cortex-m4f" CACHE STRING "cortex-m4f (hard float) or cortex-m3 (soft float)")
set_property(CACHE HALFSPIN_TARGET_CPU PROPERTY STRINGS cortex-m4f cortex-m3)
list(APPEND CMAKE_TRY_COMPILE_PLATFORM_VARIABLES HALFSPIN_TARGET_CPU)

if(HALFSPIN_TARGET_CPU STREQUAL "cortex-m4f")
  set(_halfspin_cpu_flags "-mcpu=cortex-m4 -mthumb -mfloat-abi=hard -mfpu=fpv4-sp-d16")
elseif(HALFSPIN_TARGET_CPU STREQUAL "cortex-m3")
  set(_halfspin_cpu_flags "-mcpu=cortex-m3 -mthumb -mfloat-abi=soft")
else()
  message(FATAL_ERROR "HALFSPIN_TARGET_CPU must be cortex-m4f or cortex-m3, not '${HALFSPIN_TARGET_CPU}'")
endif()

set(_halfspin_common "-ffunction-sections -fdata-sections -ffp-contract=off")
set(CMAKE_C_FLAGS_INIT "${_halfspin_cpu_flags} ${_halfspin_common}")
set(CMAKE_CXX_FLAGS_INIT "${_halfspin_cpu_flags} ${_halfspin_common} -fno-exceptions -fno-rtti -fno-threadsafe-statics")
set(CMAKE_ASM_FLAGS_INIT "${_halfspin_cpu_flags}")
set(CMAKE_EXE_LINKER_FLAGS_INIT "${_halfspin_cpu_flags} -Wl,--gc-sections")
