#pragma once
/// @file
/// halfspin: header-only, allocation-free attitude kinematics and propagation from gyro data.
/// Conventions: quaternions scalar-first (w, x, y, z), Hamilton product; an attitude q maps body
/// vectors into the reference frame, v_ref = q ⊗ v_body ⊗ q*; gyro rates in rad/s, body frame.
/// This umbrella header includes every public header (a build check keeps it complete).

// core
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/framed_rotation.hpp"
#include "halfspin/core/matrix3.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/sign_continuity.hpp"
#include "halfspin/core/vector3.hpp"

// representations
#include "halfspin/representations/axis_angle.hpp"
#include "halfspin/representations/cayley_klein.hpp"
#include "halfspin/representations/euler_angles.hpp"
#include "halfspin/representations/euler_parameters.hpp"
#include "halfspin/representations/gibbs_vector.hpp"
#include "halfspin/representations/left_handed_product.hpp"
#include "halfspin/representations/modified_rodrigues.hpp"
#include "halfspin/representations/reference_to_body.hpp"
#include "halfspin/representations/rotation_matrix.hpp"
#include "halfspin/representations/rotation_vector.hpp"
#include "halfspin/representations/scalar_last.hpp"
#include "halfspin/representations/su2_matrix.hpp"

// propagation
#include "halfspin/propagation/batch_propagator.hpp"
#include "halfspin/propagation/butcher_tableau.hpp"
#include "halfspin/propagation/commutator_free_family.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/gyro_calibration.hpp"
#include "halfspin/propagation/gyro_input.hpp"
#include "halfspin/propagation/lie_group_runge_kutta.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/rotation_vector_family.hpp"
#include "halfspin/propagation/status.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "halfspin/propagation/two_speed.hpp"

// bounds
#include "halfspin/bounds/bound_report.hpp"
#include "halfspin/bounds/commutator_free_bounds.hpp"
#include "halfspin/bounds/coning_error.hpp"
#include "halfspin/bounds/fix_interval.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/local_error_bound.hpp"
#include "halfspin/bounds/magnus_family_bounds.hpp"
#include "halfspin/bounds/mixed_motion_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/recommendation.hpp"
#include "halfspin/bounds/roundoff_floor.hpp"
#include "halfspin/bounds/runge_kutta_bounds.hpp"
#include "halfspin/bounds/sensor_error.hpp"
#include "halfspin/bounds/step_selection.hpp"

// truth
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/bias_instability.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/composed_motion.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/single_axis_oscillation.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "halfspin/truth/two_gimbal.hpp"
#include "halfspin/truth/vibration_lines.hpp"
