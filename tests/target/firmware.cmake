# Target side: the firmware example (examples/firmware) as an image for the current CPU. Its
# SysTick_Handler overrides the weak one of cmake/boards/mps2/startup.c (vector 15).
halfspin_add_mps2_executable(halfspin_firmware_example
  "${CMAKE_CURRENT_LIST_DIR}/../../examples/firmware/firmware_example.cpp")
halfspin_target_warnings(halfspin_firmware_example)
