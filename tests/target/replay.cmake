# Bit-exact replay (tests/target/replay): the integer-generated float gyro log propagated on the
# target by every stepper that avoids libm, each step's attitude printed as IEEE bit patterns. The
# host build compiles the same source (host_replay.cmake) and its ctest requires identical output.
halfspin_add_mps2_executable(halfspin_replay replay/replay.cpp)
halfspin_target_warnings(halfspin_replay)
# Stated here as well as in the toolchain file: replay depends on it (GCC fuses a·b + c into VFMA
# on the Cortex-M4F by default; a fused result is rounded once where the host rounds twice).
target_compile_options(halfspin_replay PRIVATE -ffp-contract=off)

# The same program with contraction allowed: the host test requires it to DIFFER from the host,
# which shows the comparison can fail and that the flag above is what replay needs.
if(HALFSPIN_TARGET_CPU STREQUAL "cortex-m4f")
  halfspin_add_mps2_executable(halfspin_replay_contracted replay/replay.cpp)
  halfspin_target_warnings(halfspin_replay_contracted)
  target_compile_options(halfspin_replay_contracted PRIVATE -ffp-contract=fast)
endif()
