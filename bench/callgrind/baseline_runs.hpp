#pragma once
// The baselines and the floor, one step per call over the shared workload (workload.hpp), in the
// same shape as runs.hpp so that halfspin_bench and halfspin_callgrind_driver measure one code:
//
//   EigenExponentialMapRun<T>   the obvious general-purpose exponential-map update with Eigen 3
//   (Debian
//                       libeigen3-dev): AngleAxis(|ω|·dt, ω/|ω|) → Quaternion, product,
//                       normalized(); rate at the step's end, like exponential_map_hold_end
//   OdeintRk4Run<T>     Boost.Odeint (Debian libboost-dev) runge_kutta4 on a 4-element state,
//                       q̇ = ½ q ⊗ (0, ω), one do_step by hand per call (integrate_* would copy the
//                       stepper); ω at a stage time is the sample at that node (start, middle,
//                       end of a two-period step), the input runge_kutta_4_sampled takes
//   FirstOrderNormalizedRun<T>  the first-order update many firmwares use today,
//                       q ← q + ½·dt·q ⊗ (0, ω) then q/‖q‖ (a square root and a division),
//                       with the latest rate sample (examples/tools/common/first_order_update.hpp,
//                       the code halfspin-stepstudy's reference series runs)
//   FloorExponentialMapRun<T>   the minimal hand-written kernel of the same math as
//   exponential_map_hold_end:
//                       φ = ω·dt, the series of cos(θ/2) and sin(θ/2)/θ to the θ⁶ term (the degree
//                       the library keeps), one Hamilton product written out: the floor
//
// Like BareStepRun, the Odeint and floor runs normalize once per pass over the table (the Eigen
// and first-order runs normalize every step, as specified).

#include <array>
#include <cstddef>
#include <cstdint>

#include <Eigen/Geometry>
#include <boost/numeric/odeint/stepper/runge_kutta4.hpp>

#include "first_order_update.hpp"
#include "halfspin/core/quaternion.hpp"
#include "workload.hpp"

namespace halfspin::bench {

template <class T>
class EigenExponentialMapRun {
 public:
  EigenExponentialMapRun() : gyro_(gyro_table<T>()) {}

  HALFSPIN_BENCH_FLATTEN void step() noexcept {
    const Vector3<T>& w = gyro_.rate[i_];
    const Eigen::Matrix<T, 3, 1> phi(w.x * dt_, w.y * dt_, w.z * dt_);
    const T angle = phi.norm();
    const Eigen::Matrix<T, 3, 1> axis =
        angle > T(0) ? Eigen::Matrix<T, 3, 1>(phi / angle) : Eigen::Matrix<T, 3, 1>::UnitX();
    const Eigen::Quaternion<T> dq(Eigen::AngleAxis<T>(angle, axis));
    q_ = (q_ * dq).normalized();
    i_ = (i_ + 1) & table_mask;
  }

  Quaternion<T> attitude() const noexcept { return {q_.w(), q_.x(), q_.y(), q_.z()}; }
  bool healthy_after(std::uint64_t /*steps*/) const noexcept { return healthy(attitude()); }

 private:
  const GyroTable<T>& gyro_;
  Eigen::Quaternion<T> q_ = Eigen::Quaternion<T>::Identity();
  T dt_ = T(sample_period_s);
  std::size_t i_ = 0;
};

template <class T>
class OdeintRk4Run {
 public:
  using State = std::array<T, 4>;  // (w, x, y, z)

  // q̇ = ½ q ⊗ (0, ω) with ω the sample at the stage's node: t ∈ {0, h, h, 2h} for a step 2h
  // over samples [start, middle, end].
  struct Kinematics {
    const std::array<Vector3<T>, 3>* samples;
    T quarter_step;  // node boundaries at 1/4 and 3/4 of the step
    void operator()(const State& q, State& dq, T t) const noexcept {
      const std::size_t node = static_cast<std::size_t>(t > quarter_step) +
                               static_cast<std::size_t>(t > T(3) * quarter_step);
      const Vector3<T>& w = (*samples)[node];
      dq[0] = T(-0.5) * (q[1] * w.x + q[2] * w.y + q[3] * w.z);
      dq[1] = T(0.5) * (q[0] * w.x + q[2] * w.z - q[3] * w.y);
      dq[2] = T(0.5) * (q[0] * w.y - q[1] * w.z + q[3] * w.x);
      dq[3] = T(0.5) * (q[0] * w.z + q[1] * w.y - q[2] * w.x);
    }
  };

  OdeintRk4Run() : gyro_(gyro_table<T>()) {
    // Windows of three rate samples spanning two periods, formed as for runge_kutta_4_sampled.
    for (std::size_t k = 0; k < table_size; ++k) {
      for (std::size_t j = 0; j < 3; ++j) {
        windows_[k][j] = gyro_.rate[(2 * k + j) & table_mask];
      }
    }
  }

  HALFSPIN_BENCH_FLATTEN void step() noexcept {
    const Kinematics system{&windows_[i_], T(0.25) * dt_};
    stepper_.do_step(system, q_, T(0), dt_);
    i_ = (i_ + 1) & table_mask;
    if (i_ == 0) {
      const Quaternion<T> n = normalized(attitude());
      q_ = {n.w, n.x, n.y, n.z};
    }
  }

  Quaternion<T> attitude() const noexcept { return {q_[0], q_[1], q_[2], q_[3]}; }
  bool healthy_after(std::uint64_t /*steps*/) const noexcept { return healthy(attitude()); }

 private:
  const GyroTable<T>& gyro_;
  std::array<std::array<Vector3<T>, 3>, table_size> windows_{};
  boost::numeric::odeint::runge_kutta4<State, T, State, T> stepper_{};
  State q_{T(1), T(0), T(0), T(0)};
  T dt_ = T(2 * sample_period_s);
  std::size_t i_ = 0;
};

template <class T>
class FirstOrderNormalizedRun {
 public:
  FirstOrderNormalizedRun() : gyro_(gyro_table<T>()) {}

  HALFSPIN_BENCH_FLATTEN void step() noexcept {
    q_ = tools::first_order_normalized_step(q_, gyro_.rate[i_], dt_);
    i_ = (i_ + 1) & table_mask;
  }

  const Quaternion<T>& attitude() const noexcept { return q_; }
  bool healthy_after(std::uint64_t /*steps*/) const noexcept { return healthy(q_); }

 private:
  const GyroTable<T>& gyro_;
  Quaternion<T> q_ = Quaternion<T>::identity();
  T dt_ = T(sample_period_s);
  std::size_t i_ = 0;
};

template <class T>
class FloorExponentialMapRun {
 public:
  FloorExponentialMapRun() : gyro_(gyro_table<T>()) {}

  HALFSPIN_BENCH_FLATTEN void step() noexcept {
    const Vector3<T>& w = gyro_.rate[i_];
    const T px = w.x * dt_;
    const T py = w.y * dt_;
    const T pz = w.z * dt_;
    const T t = px * px + py * py + pz * pz;
    const T c = T(1) + t * (T(-1.0 / 8) + t * (T(1.0 / 384) + t * T(-1.0 / 46080)));
    const T s = T(0.5) + t * (T(-1.0 / 48) + t * (T(1.0 / 3840) + t * T(-1.0 / 645120)));
    const T bx = s * px;
    const T by = s * py;
    const T bz = s * pz;
    const Quaternion<T> a = q_;
    q_ = {a.w * c - a.x * bx - a.y * by - a.z * bz, a.w * bx + a.x * c + a.y * bz - a.z * by,
          a.w * by - a.x * bz + a.y * c + a.z * bx, a.w * bz + a.x * by - a.y * bx + a.z * c};
    i_ = (i_ + 1) & table_mask;
    if (i_ == 0) {
      q_ = normalized(q_);
    }
  }

  const Quaternion<T>& attitude() const noexcept { return q_; }
  bool healthy_after(std::uint64_t /*steps*/) const noexcept { return healthy(q_); }

 private:
  const GyroTable<T>& gyro_;
  Quaternion<T> q_ = Quaternion<T>::identity();
  T dt_ = T(sample_period_s);
  std::size_t i_ = 0;
};

}  // namespace halfspin::bench
