# The demo (`cmake --workflow --preset demo`, target run_demo): the invented survey drone of
# examples/tools/common/demo_scenario.hpp — a banked turn carrying 85 Hz engine-vibration coning,
# 1 kHz gyro, budget 0.1° over 10 minutes.
#   1. halfspin-stepstudy on the scenario: the table, the recommendation, CSV and SVG under OUT,
#      with the first-order firmware update as a reference series (--baseline) and its same-cost
#      factor line (float, at the demo's gyro rate);
#   2. halfspin-gyro-log writes the scenario's 10-minute gyro log in the form the recommended
#      method takes (rates or delta-angles), and the truth;
#   3. halfspin-propagate runs the log through the recommended method in double and in float
#      (what the board runs) and reports the attitude error against the truth.
# Invoked as cmake -DSTEPSTUDY=… -DGYRO_LOG=… -DPROPAGATE=… -DOUT=dir -P run_demo.cmake.
cmake_minimum_required(VERSION 3.25)
foreach(v STEPSTUDY GYRO_LOG PROPAGATE OUT)
  if(NOT DEFINED ${v})
    message(FATAL_ERROR "run_demo.cmake: -D${v}=… is required")
  endif()
endforeach()
file(MAKE_DIRECTORY "${OUT}")

# 0.1° in rad, written out (CMake's math() is integer-only): 0.1·π/180.
set(budget_rad 0.0017453292519943296)
set(horizon_s 600)
set(gyro_rate_hz 1000)

function(run step)
  message(STATUS "")
  message(STATUS "== ${step} ==")
  execute_process(COMMAND ${ARGN} COMMAND_ECHO STDOUT RESULT_VARIABLE rc)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "${step} failed (exit ${rc})")
  endif()
endfunction()

run("1. Which method and step meet 0.1 deg over 10 minutes?"
  "${STEPSTUDY}" --motion demo --budget ${budget_rad} --horizon ${horizon_s}
  --gyro-rate ${gyro_rate_hz} --baseline --csv "${OUT}/demo_study.csv" --svg "${OUT}/demo_study.svg"
  --recommendation-file "${OUT}/demo_recommendation.txt")

file(STRINGS "${OUT}/demo_recommendation.txt" lines)
foreach(line IN LISTS lines)
  if(line MATCHES "^([a-z_]+)=(.*)$")
    set(rec_${CMAKE_MATCH_1} "${CMAKE_MATCH_2}")
  endif()
endforeach()
if(NOT rec_method OR NOT rec_form)
  message(FATAL_ERROR "no recommendation in ${OUT}/demo_recommendation.txt")
endif()

run("2. The scenario's gyro log (${rec_form} form, ${gyro_rate_hz} Hz, ${horizon_s} s) and its truth"
  "${GYRO_LOG}" --motion demo --form ${rec_form} --rate ${gyro_rate_hz} --duration ${horizon_s}
  --output "${OUT}/demo_gyro_log.csv" --truth "${OUT}/demo_truth.csv")

run("3. The log through ${rec_method} in double (the bound's scalar), against the truth"
  "${PROPAGATE}" "${OUT}/demo_gyro_log.csv" --method ${rec_method} --scalar double
  --truth "${OUT}/demo_truth.csv" --initial truth --output "${OUT}/demo_attitude_double.csv")

# In float the tools use the compensated accumulation (the attitude as a pair of floats), whose
# worst-case rounding over these 10 minutes is a fraction of the budget (step 1 prints the float
# recommendation by a bound); with --accumulation plain the float rounding alone, N × c·u, would
# exceed it by a bound.
run("4. The same in float (what the board runs, compensated accumulation), against the truth"
  "${PROPAGATE}" "${OUT}/demo_gyro_log.csv" --method ${rec_method} --scalar float
  --truth "${OUT}/demo_truth.csv" --initial truth --output "${OUT}/demo_attitude_float.csv")

message(STATUS "")
message(STATUS "Demo files in ${OUT}: demo_study.csv, demo_study.svg (the charts),")
message(STATUS "demo_recommendation.txt, demo_gyro_log.csv, demo_truth.csv,")
message(STATUS "demo_attitude_double.csv, demo_attitude_float.csv.")
message(STATUS "Budget 0.1 deg = ${budget_rad} rad over ${horizon_s} s.")
