# Target side of the C interface test (tests/c_interface): the C program and its C++ reference
# linked with halfspin::c (c/, compiled here with the cross toolchain) into one image; run by the
# host's target.<cpu>.c_interface test (host_tests.cmake).
include("${CMAKE_CURRENT_LIST_DIR}/../c_interface/c_interface_test.cmake")
halfspin_add_mps2_executable(halfspin_c_interface_tests)
halfspin_add_c_interface_test(halfspin_c_interface_tests)
