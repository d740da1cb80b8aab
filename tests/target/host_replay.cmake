# Host side of the bit-exact replay (included once per CPU by host_tests.cmake, with `cpu`, `bin`
# and `qemu` set). The host program is built from the same source as the target image, with the
# flags replay needs: -ffp-contract=off (no fused multiply-add; x86-64 without -march has no FMA
# anyway, but -march=native or -mfma would fuse), no -ffast-math (it reassociates and, on x86,
# links code that sets flush-to-zero). -fexcess-precision is not needed: x86-64 evaluates float
# in SSE registers (FLT_EVAL_METHOD 0, checked by a static_assert in replay.cpp).
if(NOT TARGET halfspin_replay_host)
  add_executable(halfspin_replay_host "${CMAKE_CURRENT_LIST_DIR}/replay/replay.cpp")
  target_link_libraries(halfspin_replay_host PRIVATE halfspin::halfspin)
  target_compile_options(halfspin_replay_host PRIVATE -ffp-contract=off)
  # GCC 12 ignores -ffp-contract=off in its SLP vectorizer when the target has FMA (-march=native
  # on a recent x86-64, -mfma): it emits vfmaddsub for the Hamilton product and replay breaks
  # (seen with Debian's g++ 12.2; clang does not). Harmless without FMA, which is the default.
  if(CMAKE_CXX_COMPILER_ID STREQUAL "GNU")
    target_compile_options(halfspin_replay_host PRIVATE -fno-tree-slp-vectorize)
  endif()
  halfspin_target_warnings(halfspin_replay_host)
endif()

string(JOIN "|" _halfspin_qemu_joined ${qemu})
# Target and host outputs must be identical line for line (every stepper, every step).
add_test(NAME target.${cpu}.replay
  COMMAND "${CMAKE_COMMAND}"
          "-DTARGET_COMMAND=${_halfspin_qemu_joined}|${bin}/halfspin_replay.elf"
          "-DHOST_COMMAND=$<TARGET_FILE:halfspin_replay_host>"
          "-DOUT_DIR=${CMAKE_CURRENT_BINARY_DIR}/replay-${cpu}" -DEXPECT=match
          -P "${CMAKE_CURRENT_LIST_DIR}/replay/compare_replay.cmake")
set_tests_properties(target.${cpu}.replay PROPERTIES
  LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 900)

# Sensitivity check: the Cortex-M4F image built with contraction allowed must NOT replay.
if(cpu STREQUAL "cortex-m4f")
  add_test(NAME target.${cpu}.replay_detects_contraction
    COMMAND "${CMAKE_COMMAND}"
            "-DTARGET_COMMAND=${_halfspin_qemu_joined}|${bin}/halfspin_replay_contracted.elf"
            "-DHOST_COMMAND=$<TARGET_FILE:halfspin_replay_host>"
            "-DOUT_DIR=${CMAKE_CURRENT_BINARY_DIR}/replay-${cpu}-contracted" -DEXPECT=differ
            -P "${CMAKE_CURRENT_LIST_DIR}/replay/compare_replay.cmake")
  set_tests_properties(target.${cpu}.replay_detects_contraction PROPERTIES
    LABELS target FIXTURES_REQUIRED target_${cpu} TIMEOUT 900)
endif()
