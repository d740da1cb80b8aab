// Static analysis only (cmake/static_analysis.sh; never built into a target): clang-tidy looks at
// uninstantiated templates only superficially, so this unit instantiates the library's templates
// in float and double, with inputs the analyzer cannot see through. The steppers, the propagator,
// the bounds and the truth motions are instantiated by the tools (examples/tools/), which are
// analysed too; this unit covers the rest: core, every representation, the batch propagator,
// the two-speed accumulator and the gyro calibration stage.
#include "halfspin/halfspin.hpp"

namespace halfspin {

// Class templates: every member.
template struct Vector3<float>;
template struct Vector3<double>;
template struct Quaternion<float>;
template struct Quaternion<double>;
template struct Matrix3<float>;
template struct Matrix3<double>;
template class TwoSpeedAccumulator<float>;
template class TwoSpeedAccumulator<double>;
template class BatchPropagator<float, 8>;
template class BatchPropagator<double, 4>;
template class BatchPropagator<float, 3, NoRenormalization>;
template class BatchPropagator<float, 8, FirstOrderRenormalization, CompensatedAccumulation>;
template class BatchPropagator<double, 4, NoRenormalization, CompensatedAccumulation>;
// The gyro calibration stage and a calibrated propagator of each sample layout.
template struct GyroCalibrationParameters<float>;
template struct GyroCalibrationParameters<double>;
template class GyroCalibration<float>;
template class GyroCalibration<double>;
template class Propagator<float, Coning2Sample, FirstOrderRenormalization, CompensatedAccumulation,
                          GyroCalibration<float>>;
template class Propagator<double, Magnus4, ExactRenormalization, PlainAccumulation,
                          GyroCalibration<double>>;
// The tools evaluate truth in long double only.
template struct VibrationLinesMotion<float>;
template struct VibrationLinesMotion<double>;
// The synthetic gyro's noise processes (the tools use them only through tests).
template class BiasInstabilityBank<float>;
template class BiasInstabilityBank<double>;
template class SyntheticGyro<float, ConstantRateMotion<float>>;
template class SyntheticGyro<double, ConstantRateMotion<double>>;
template float gauss_markov_allan_variance<float>(float, float, float) noexcept;
template double gauss_markov_allan_variance<double>(double, double, double) noexcept;

}  // namespace halfspin

namespace {

using namespace halfspin;

template <class T>
T exercise(const Quaternion<T>& q, const Quaternion<T>& r, const Vector3<T>& v, const Matrix3<T>& m,
           EulerSequence sequence) noexcept {
  T sink = angle_between(q, r) + norm(quaternion_log(q)) + norm(quaternion_exp(v).vector());
  sink += determinant(m * transpose(m)) + norm(cross_matrix(v) * v) + dot(rotate(q, v), v);
  sink += norm(nearest_sign(q, r)) + norm(with_nonnegative_scalar(q)) + norm(normalized(q)) +
          norm(normalized(v));
  sink += norm(inverse(q) * conjugate(r)) + (is_finite(q) && is_finite(v) ? T(1) : T(0));

  const AxisAngle<T> axis_angle = to_axis_angle(q);
  sink += norm(quaternion_from_axis_angle(axis_angle));
  sink += norm(quaternion_from_cayley_klein(to_cayley_klein(q)));
  const EulerDecomposition<T> euler = to_euler_angles(q, sequence);
  sink += norm(quaternion_from_euler_angles(euler.angles)) + (euler.near_singular ? T(1) : T(0));
  sink += norm(quaternion_from_euler_parameters(to_euler_parameters(q)));
  sink += norm(quaternion_from_gibbs_vector(to_gibbs_vector(q)));
  sink += norm(quaternion_from_left_handed_convention(
      left_handed_product(to_left_handed_convention(q), to_left_handed_convention(r))));
  const ModifiedRodrigues<T> mrp = to_modified_rodrigues(q);
  sink += norm(quaternion_from_modified_rodrigues(switch_to_short(shadow_set(mrp))));
  sink += norm(quaternion_from_reference_to_body(to_reference_to_body(q)));
  sink += norm(quaternion_from_rotation_matrix(to_rotation_matrix(q)) *
               quaternion_from_rotation_matrix(m));
  sink += norm(quaternion_from_rotation_vector(to_rotation_vector(q)));
  sink += norm(quaternion_from_scalar_last(to_scalar_last(q)));
  sink += norm(quaternion_from_su2_matrix(to_su2_matrix(q)));

  const GyroNoiseTerms<T> gyro{v.x, v.y, v.z, q.w};
  sink += sensor_attitude_error(gyro, r.w).combined_rad + sensor_fraction_budget(gyro, r.x, r.y) +
          angle_random_walk_from_degrees_per_root_hour(v.x) + rate_from_degrees_per_hour(v.y) +
          rate_random_walk_from_degrees_per_hour_root_hour(v.z);
  GyroCalibrationParameters<T> parameters;
  parameters.scale_misalignment = m;
  parameters.bias = v;
  const GyroCalibration<T> stage(parameters);
  sink += norm(stage.rate(v)) + norm(stage.delta_angle(v, T(1e-3))) +
          (stage.check() == CalibrationCheck::valid ? T(1) : T(0));
  sink += calibration_check_name(stage.check())[0] == 'v' ? T(1) : T(0);
  CalibratedPropagator<T, Coning2Sample> calibrated(q, GyroLimits<T>{T(35), T(0.01)}, stage);
  sink += calibrated.set_temperature(v.x) == Status::ok ? T(1) : T(0);
  sink += calibrated.push(v, T(1e-3)) == Status::ok ? norm(calibrated.attitude()) : T(0);
  CalibratedPropagator<T, RungeKutta4RateFunction> rate_function(q, GyroLimits<T>{T(35), T(0.01)},
                                                                 stage);
  sink += rate_function.advance([&v](T tau) noexcept { return tau * v; }, T(1e-3)) == Status::ok
              ? norm(rate_function.attitude()) + norm(rate_function.calibration().bias())
              : T(0);

  TwoSpeedAccumulator<T> accumulator(4);
  if (accumulator.add(v)) {
    sink += norm(two_speed_update(q, accumulator.take()));
  }
  return sink;
}

}  // namespace

// Entry points with external linkage, so that nothing above is dead code to the analyzer.
float halfspin_static_analysis_float(const halfspin::Quaternion<float>& q,
                                     const halfspin::Quaternion<float>& r,
                                     const halfspin::Vector3<float>& v,
                                     const halfspin::Matrix3<float>& m,
                                     halfspin::EulerSequence sequence) noexcept {
  return exercise(q, r, v, m, sequence);
}
double halfspin_static_analysis_double(const halfspin::Quaternion<double>& q,
                                       const halfspin::Quaternion<double>& r,
                                       const halfspin::Vector3<double>& v,
                                       const halfspin::Matrix3<double>& m,
                                       halfspin::EulerSequence sequence) noexcept {
  return exercise(q, r, v, m, sequence);
}
