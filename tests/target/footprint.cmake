# Footprint images (included by tests/target/CMakeLists.txt in the cross build): one minimal
# image per stepper, scalar and mode from tests/target/footprint/footprint_image.cpp, written to
# <build>/footprint/ with a manifest that the hygiene check (host_footprint.cmake) and the report
# scripts (bench/target/) read. Modes: "propagator" (samples pushed through a Propagator with the
# default first-order renormalization) and "step" (the stepper's step function alone).
# Also the hygiene fixtures in <build>/hygiene-fixtures/: images that break one rule on purpose,
# to prove each check can fail.

# Every stepper of the catalogue in float; these also in double (each must be catalogued).
include("${CMAKE_CURRENT_LIST_DIR}/../../cmake/HalfspinCatalogue.cmake")
halfspin_read_catalogue(_catalogue_ids _catalogue_types _catalogue_names)
set(HALFSPIN_FOOTPRINT_DOUBLE
  exponential_map_midpoint_mean magnus_4 runge_kutta_4_sampled coning_2_sample)
foreach(name IN LISTS HALFSPIN_FOOTPRINT_DOUBLE)
  if(NOT name IN_LIST _catalogue_names)
    message(FATAL_ERROR "footprint.cmake: ${name} is not in the stepper catalogue")
  endif()
endforeach()
# name | stepper type | scalars
set(HALFSPIN_FOOTPRINT_STEPPERS "")
foreach(name type IN ZIP_LISTS _catalogue_names _catalogue_types)
  set(scalars float)
  if(name IN_LIST HALFSPIN_FOOTPRINT_DOUBLE)
    set(scalars "float,double")
  endif()
  list(APPEND HALFSPIN_FOOTPRINT_STEPPERS "${name}|${type}|${scalars}")
endforeach()

# The project's warning set as errors, on the C++ sources (the C startup file is the board's).
# HALFSPIN_WARNING_FLAGS is set inside the add_subdirectory() of the library, so it is empty at
# this level; loading it inside a function keeps the fix local to these images.
function(halfspin_footprint_warnings target)
  include("${CMAKE_CURRENT_FUNCTION_LIST_DIR}/../../cmake/HalfspinWarnings.cmake")
  target_compile_options(${target} PRIVATE
    "$<$<COMPILE_LANGUAGE:CXX>:${HALFSPIN_WARNING_FLAGS};-Werror>")
endfunction()

# An image on the board's memory map with the minimal reset of footprint/minimal_startup.c
# instead of the board's startup file (whose semihosting console links newlib's stdio and heap;
# see minimal_startup.c). libnosys only resolves system calls that something really references
# (the heap fixture's malloc needs _sbrk); nothing in a clean image does.
function(halfspin_add_footprint_executable name)
  add_executable(${name} ${ARGN} "${CMAKE_CURRENT_FUNCTION_LIST_DIR}/footprint/minimal_startup.c")
  set_target_properties(${name} PROPERTIES SUFFIX ".elf")
  target_link_libraries(${name} PRIVATE halfspin::halfspin)
  target_link_options(${name} PRIVATE
    "-T${HALFSPIN_MPS2_DIR}/mps2.ld" --specs=nosys.specs -nostartfiles
    "-Wl,-Map=$<TARGET_FILE_DIR:${name}>/${name}.map")
  set_target_properties(${name} PROPERTIES LINK_DEPENDS "${HALFSPIN_MPS2_DIR}/mps2.ld")
endfunction()

set(HALFSPIN_FOOTPRINT_DIR "${CMAKE_BINARY_DIR}/footprint")
set_property(GLOBAL PROPERTY HALFSPIN_FOOTPRINT_MANIFEST "")

# The stepper type of a catalogued stepper name (fails at configure time for any other name).
function(halfspin_footprint_stepper_type name out)
  list(FIND _catalogue_names ${name} at)
  if(at EQUAL -1)
    message(FATAL_ERROR "footprint.cmake: ${name} is not in the stepper catalogue")
  endif()
  list(GET _catalogue_types ${at} type)
  set(${out} ${type} PARENT_SCOPE)
endfunction()

# One footprint image: footprint_<stepper><variant>_<scalar>_<mode>, from footprint_image.cpp
# with the stepper, scalar and mode, plus the variant's extra compile definitions; its manifest
# line (image stepper<variant> scalar mode stepper-type) names the variant as
# bench/target/cycle_trace.py reports it ("<stepper>+compensated", "<stepper>+calibrated").
function(halfspin_add_footprint_image stepper_name scalar mode variant)
  halfspin_footprint_stepper_type(${stepper_name} stepper_type)
  set(image footprint_${stepper_name}${variant}_${scalar}_${mode})
  halfspin_add_footprint_executable(${image} footprint/footprint_image.cpp)
  target_compile_definitions(${image} PRIVATE
    "HALFSPIN_FOOTPRINT_STEPPER=${stepper_type}"
    "HALFSPIN_FOOTPRINT_SCALAR=${scalar}"
    "HALFSPIN_FOOTPRINT_STEP_ONLY=$<STREQUAL:${mode},step>"
    ${ARGN})
  # Per-function stack frames (<object>.su) for the report's stack column.
  target_compile_options(${image} PRIVATE -fstack-usage)
  halfspin_footprint_warnings(${image})
  set_target_properties(${image} PROPERTIES RUNTIME_OUTPUT_DIRECTORY "${HALFSPIN_FOOTPRINT_DIR}")
  set_property(GLOBAL APPEND_STRING PROPERTY HALFSPIN_FOOTPRINT_MANIFEST
    "${image} ${stepper_name}${variant} ${scalar} ${mode} ${stepper_type}\n")
endfunction()

# Every stepper, its scalars, both modes.
foreach(entry IN LISTS HALFSPIN_FOOTPRINT_STEPPERS)
  string(REPLACE "|" ";" fields "${entry}")
  list(GET fields 0 stepper_name)
  list(GET fields 2 scalars)
  string(REPLACE "," ";" scalars "${scalars}")
  foreach(scalar IN LISTS scalars)
    foreach(mode IN ITEMS propagator step)
      halfspin_add_footprint_image(${stepper_name} ${scalar} ${mode} "")
    endforeach()
  endforeach()
endforeach()
# The compensated accumulation (compensated_accumulation.hpp) on a few steppers, float, the two
# cheapest among them: its flash and its cycles, per step in the step images (increment +
# accumulation) and per sample in the propagator images.
foreach(stepper_name IN ITEMS exponential_map_hold_end coning_1_sample coning_2_sample
                             coning_3_sample magnus_4 runge_kutta_4_sampled commutator_free_4)
  foreach(mode IN ITEMS propagator step)
    halfspin_add_footprint_image(${stepper_name} float ${mode} +compensated
      "HALFSPIN_FOOTPRINT_ACCUMULATION=halfspin::CompensatedAccumulation")
  endforeach()
endforeach()
# The gyro calibration stage (gyro_calibration.hpp) on a few steppers, propagator images only
# (the stage acts per sample, before the stepper): rates with windows of 1 and 3 samples, and
# delta-angles (M·(Δθ − b·dt)). Same plain accumulation as the stepper's own propagator image, so
# the difference is the stage's per-sample cost and its flash.
foreach(entry IN ITEMS exponential_map_hold_end|float coning_1_sample|float
                       coning_2_sample|float,double magnus_4|float runge_kutta_4_sampled|float)
  string(REPLACE "|" ";" fields "${entry}")
  list(GET fields 0 stepper_name)
  list(GET fields 1 scalars)
  string(REPLACE "," ";" scalars "${scalars}")
  foreach(scalar IN LISTS scalars)
    halfspin_add_footprint_image(${stepper_name} ${scalar} propagator +calibrated
      "HALFSPIN_FOOTPRINT_CALIBRATION=1")
  endforeach()
endforeach()
get_property(_halfspin_footprint_manifest GLOBAL PROPERTY HALFSPIN_FOOTPRINT_MANIFEST)
file(MAKE_DIRECTORY "${HALFSPIN_FOOTPRINT_DIR}")
file(WRITE "${HALFSPIN_FOOTPRINT_DIR}/manifest.txt" "${_halfspin_footprint_manifest}")

# Fixtures that must fail the hygiene check (tests in host_footprint.cmake). Kept out of the
# directories the check scans as the project's images.
foreach(fixture IN ITEMS heap double exceptions)
  set(image hygiene_fixture_${fixture})
  halfspin_add_footprint_executable(${image} footprint/hygiene_fixture_${fixture}.cpp)
  halfspin_footprint_warnings(${image})
  set_target_properties(${image} PROPERTIES
    RUNTIME_OUTPUT_DIRECTORY "${CMAKE_BINARY_DIR}/hygiene-fixtures")
endforeach()
