// halfspin_float_accuracy: what the float attitude costs in accuracy, per accumulation policy
// (issue 14). A measurement program: it prints figures and asserts nothing (the unit tests and the
// soak hold the bounds). Two scenarios, both invented:
//
//   demo   the tools' demo scenario (examples/tools/common/demo_scenario.hpp: a survey drone in a
//          banked turn with 85 Hz engine coning), 600 s of 1 kHz delta-angles, every delta-angle
//          stepper, first-order renormalization: the largest attitude error over the run in
//          double, in float with the plain accumulation and in float with the compensated one.
//   hover  a hovering vehicle: a fixed attitude (20 start attitudes, uniform on SO(3) from a fixed
//          seed) carrying a single-axis vibration (0.01 rad at 120 Hz about body x) or a two-axis
//          one (that plus 0.006 rad at 87 Hz about body y), 20 minutes at 2 kHz, every
//          sample-driven stepper of the catalogue, float, both accumulation policies: the worst
//          error over the start attitudes. Single-axis rotations commute, so only the quadrature's
//          truncation (the double column) and rounding are left there.
//
// Samples are computed in long double from the truth (closed form, or Gauss–Legendre for the
// delta-angles of the two-axis motion: truth/synthetic_gyro.hpp) and rounded once to the scalar
// type. Errors are the angle between the propagated and the true attitude (rad), checked every
// 1200 samples (a multiple of every stepper's samples per step).
//
//   sources  where the compensated float error left in hover comes from: the single-axis hover
//          (one start attitude, --minutes, default 2) with the compensated accumulation as it is,
//          with the product q_hi ⊗ δ formed exactly (in double, added to the pair as two floats),
//          and with the increment δ also formed in double from the same float samples; the double
//          propagator for reference. An experiment, not a policy of the library.
//
// Usage: halfspin_float_accuracy [demo|hover|all|sources] [--minutes M] [--attitudes N]
//   --minutes M    hover duration (default 20; sources 2); --attitudes N   start attitudes
//   (default 20).
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <random>
#include <string>
#include <vector>

#include "demo_scenario.hpp"
#include "halfspin/halfspin.hpp"

namespace {

using namespace halfspin;
using LD = long double;

template <class T>
Vector3<T> narrow(const Vector3<LD>& v) {
  return {static_cast<T>(v.x), static_cast<T>(v.y), static_cast<T>(v.z)};
}
template <class T>
Quaternion<T> narrow(const Quaternion<LD>& q) {
  return {static_cast<T>(q.w), static_cast<T>(q.x), static_cast<T>(q.y), static_cast<T>(q.z)};
}
template <class T>
Quaternion<LD> widen(const Quaternion<T>& q) {
  return {static_cast<LD>(q.w), static_cast<LD>(q.x), static_cast<LD>(q.y), static_cast<LD>(q.z)};
}

constexpr long checkpoint_every = 1200;  // samples; a multiple of 1, 2, 3 and 4

// One motion sampled: rate at t_k (k = 0..K) and delta-angle over (t_{k−1}, t_k] (k = 1..K),
// in long double; truth body attitudes at the checkpoints (k a multiple of checkpoint_every).
struct Sampled {
  LD dt = 0;
  std::vector<Vector3<LD>> rate;
  std::vector<Vector3<LD>> delta;  // delta[0] unused
  std::vector<Quaternion<LD>> truth;
};

template <class Motion>
Sampled sample(const Motion& m, LD dt, long samples) {
  Sampled s;
  s.dt = dt;
  s.rate.resize(static_cast<std::size_t>(samples + 1));
  s.delta.resize(static_cast<std::size_t>(samples + 1));
  for (long k = 0; k <= samples; ++k) {
    const LD t = static_cast<LD>(k) * dt;
    s.rate[static_cast<std::size_t>(k)] = m.rate(t);
    if (k > 0) {
      s.delta[static_cast<std::size_t>(k)] = truth_delta_angle(m, t - dt, t);
    }
    if (k % checkpoint_every == 0) {
      s.truth.push_back(m.attitude(t));
    }
  }
  return s;
}

// The samples rounded once to T, as a gyro driver would hand them over.
template <class T>
struct Rounded {
  std::vector<Vector3<T>> rate;
  std::vector<Vector3<T>> delta;
};
template <class T>
Rounded<T> rounded(const Sampled& s) {
  Rounded<T> r;
  r.rate.reserve(s.rate.size());
  r.delta.reserve(s.delta.size());
  for (const Vector3<LD>& v : s.rate) {
    r.rate.push_back(narrow<T>(v));
  }
  for (const Vector3<LD>& v : s.delta) {
    r.delta.push_back(narrow<T>(v));
  }
  return r;
}

// Float samples widened to double: a double propagator fed exactly what the float one gets, so
// that the difference of the two is the float propagation's own rounding (the float rounding of
// the samples themselves is the gyro driver's, and repeats with the sample pattern: a vibration
// whose period is a whole number of samples rounds the same way every period).
Rounded<double> widened(const Rounded<float>& f) {
  Rounded<double> d;
  for (const Vector3<float>& v : f.rate) {
    d.rate.push_back({v.x, v.y, v.z});
  }
  for (const Vector3<float>& v : f.delta) {
    d.delta.push_back({v.x, v.y, v.z});
  }
  return d;
}

// Largest angle (rad) between the propagated attitude and frame ⊗ truth over the checkpoints.
template <class Stepper, class T, class Accumulation>
LD run(const Sampled& s, const Rounded<T>& r, const Quaternion<LD>& frame) {
  Propagator<T, Stepper, FirstOrderRenormalization, Accumulation> p(narrow<T>(frame * s.truth[0]),
                                                                    GyroLimits<T>{T(1e3), T(1)});
  const T dt = static_cast<T>(s.dt);
  const long samples = static_cast<long>(s.rate.size()) - 1;
  const long first = Stepper::layout == SampleLayout::rates_spanning ? 0 : 1;
  LD worst = 0;
  for (long k = first; k <= samples; ++k) {
    const std::size_t i = static_cast<std::size_t>(k);
    const Status status =
        p.push(carries_delta_angles(Stepper::layout) ? r.delta[i] : r.rate[i], dt);
    if (status != Status::ok && status != Status::waiting_for_samples) {
      std::fprintf(stderr, "%s: sample %ld rejected (%s)\n", Stepper::name, k, status_name(status));
      std::exit(2);
    }
    if (k % checkpoint_every == 0 && k > 0) {
      const Quaternion<LD> truth = frame * s.truth[static_cast<std::size_t>(k / checkpoint_every)];
      worst = std::fmax(worst, angle_between(widen(p.attitude()), truth));
    }
  }
  return worst;
}

void demo() {
  const LD dt = 1.0L / static_cast<LD>(tools::demo::gyro_rate_hz);
  const long samples = std::lround(tools::demo::horizon_s * tools::demo::gyro_rate_hz);
  std::printf("demo scenario: %.0f s of %.0f Hz delta-angles, first-order renormalization\n",
              tools::demo::horizon_s, tools::demo::gyro_rate_hz);
  const Sampled s = sample(tools::demo::motion<LD>(), dt, samples);
  const Rounded<float> f = rounded<float>(s);
  const Rounded<double> d = rounded<double>(s);
  const Rounded<double> fd = widened(f);
  const Quaternion<LD> identity = Quaternion<LD>::identity();
  std::printf(
      "Errors against the truth (rad); \"double, float samples\" is a double propagator "
      "fed the float-rounded samples\n");
  std::printf(
      "| stepper | double | double, float samples | float, plain | float, compensated | "
      "compensated / double | compensated / (double, float samples) |\n"
      "|---|---:|---:|---:|---:|---:|---:|\n");
  StepperCatalogue::for_each([&](auto entry) {
    using S = typename decltype(entry)::stepper;
    if constexpr (carries_delta_angles(S::layout)) {
      const LD ed = run<S, double, PlainAccumulation>(s, d, identity);
      const LD efd = run<S, double, PlainAccumulation>(s, fd, identity);
      const LD ep = run<S, float, PlainAccumulation>(s, f, identity);
      const LD ec = run<S, float, CompensatedAccumulation>(s, f, identity);
      std::printf("| `%s` | %.3Le | %.3Le | %.3Le | %.3Le | %.2Lf | %.2Lf |\n", S::name, ed, efd,
                  ep, ec, ec / ed, ec / efd);
    }
  });
}

void hover(LD minutes, int attitudes) {
  const LD dt = 1.0L / 2000;
  const long samples = std::lround(minutes * 60 * 2000) / checkpoint_every * checkpoint_every;
  std::printf(
      "\nhover: %d start attitudes, %.1Lf min at 2 kHz, first-order renormalization, "
      "float; worst error over the start attitudes (rad)\n",
      attitudes, minutes);
  const SingleAxisOscillation<LD> x_axis{Vector3<LD>{1, 0, 0}, 0.01L, 120.0L, 0.0L,
                                         Quaternion<LD>::identity()};
  const SingleAxisOscillation<LD> y_axis{Vector3<LD>{0, 1, 0}, 0.006L, 87.0L, 0.3L,
                                         Quaternion<LD>::identity()};
  std::vector<Quaternion<LD>> frames;
  std::mt19937_64 rng(20261203);
  std::normal_distribution<double> g(0.0, 1.0);
  for (int i = 0; i < attitudes; ++i) {
    frames.push_back(normalized(Quaternion<LD>{g(rng), g(rng), g(rng), g(rng)}));
  }
  // Start attitudes q_f ⊗ q(t): a constant frame rotation on the left leaves the body rate, and
  // so the samples, unchanged.
  const Sampled single = sample(x_axis, dt, samples);
  const Sampled two = sample(compose<LD>(x_axis, y_axis), dt, samples);
  const Rounded<float> single_f = rounded<float>(single);
  const Rounded<float> two_f = rounded<float>(two);
  const Rounded<double> single_d = widened(single_f);
  const Rounded<double> two_d = widened(two_f);
  std::printf(
      "Columns \"double\": a double propagator fed the same float samples; the float "
      "propagation's own rounding is the difference\n");
  std::printf(
      "| stepper | single axis: double | float, plain | float, compensated | two axes: "
      "double | float, plain | float, compensated |\n|---|---:|---:|---:|---:|---:|---:|\n");
  LD worst_rounding = 0;  // |compensated float − double| on the same samples, largest
  StepperCatalogue::for_each([&](auto entry) {
    using S = typename decltype(entry)::stepper;
    if constexpr (S::layout != SampleLayout::rate_function) {
      LD e[6] = {0, 0, 0, 0, 0, 0};
      for (const Quaternion<LD>& frame : frames) {
        const LD sd = run<S, double, PlainAccumulation>(single, single_d, frame);
        const LD sc = run<S, float, CompensatedAccumulation>(single, single_f, frame);
        const LD td = run<S, double, PlainAccumulation>(two, two_d, frame);
        const LD tc = run<S, float, CompensatedAccumulation>(two, two_f, frame);
        e[0] = std::fmax(e[0], sd);
        e[1] = std::fmax(e[1], run<S, float, PlainAccumulation>(single, single_f, frame));
        e[2] = std::fmax(e[2], sc);
        e[3] = std::fmax(e[3], td);
        e[4] = std::fmax(e[4], run<S, float, PlainAccumulation>(two, two_f, frame));
        e[5] = std::fmax(e[5], tc);
        worst_rounding =
            std::fmax(worst_rounding, std::fmax(std::fabs(sc - sd), std::fabs(tc - td)));
      }
      std::printf("| `%s` | %.2Le | %.2Le | %.2Le | %.2Le | %.2Le | %.2Le |\n", S::name, e[0], e[1],
                  e[2], e[3], e[4], e[5]);
      std::fflush(stdout);
    }
  });
  std::printf("largest |compensated float error − double error| on the same samples: %.3Le rad\n",
              worst_rounding);
}

// The `sources` experiment for one stepper (header comment).
template <class S>
void rounding_sources(LD minutes) {
  using A = CompensatedAccumulation;
  const SingleAxisOscillation<LD> m{Vector3<LD>{1, 0, 0}, 0.01L, 120.0L, 0.0L,
                                    Quaternion<LD>::identity()};
  const LD dt = 1.0L / 2000;
  constexpr std::size_t window = S::window;
  constexpr long periods = static_cast<long>(periods_per_step(S::layout, window));
  const long samples = std::lround(minutes * 60 * 2000) / periods * periods;
  const Quaternion<LD> frame = normalized(Quaternion<LD>{0.3L, -0.5L, 0.7L, 0.2L});
  const Quaternion<float> q0 = narrow<float>(frame * m.attitude(0));
  A::State<float> as_is = A::start(q0);
  A::State<float> exact_product = as_is;
  A::State<float> double_increment = as_is;
  Quaternion<double> in_double{q0.w, q0.x, q0.y, q0.z};
  const auto add_as_two_floats = [](A::State<float>& st, const Quaternion<double>& p) {
    const Quaternion<float> hi{static_cast<float>(p.w), static_cast<float>(p.x),
                               static_cast<float>(p.y), static_cast<float>(p.z)};
    const Quaternion<float> lo{static_cast<float>(p.w - static_cast<double>(hi.w)),
                               static_cast<float>(p.x - static_cast<double>(hi.x)),
                               static_cast<float>(p.y - static_cast<double>(hi.y)),
                               static_cast<float>(p.z - static_cast<double>(hi.z))};
    detail::add_to_pair(st.hi, st.lo, hi);
    detail::add_to_pair(st.hi, st.lo, lo);
  };
  const auto renormalize = [](A::State<float>& st) {
    st = A::with_attitude(st, FirstOrderRenormalization{}.apply(A::attitude(st)));
  };
  const auto widen_d = [](const Quaternion<float>& q) {
    return Quaternion<double>{q.w, q.x, q.y, q.z};
  };
  std::array<Vector3<float>, window> in{};
  std::array<Vector3<double>, window> in_d{};
  for (long k = 0; k < samples; k += periods) {
    for (std::size_t i = 0; i < window; ++i) {
      const long j = k + static_cast<long>(i);
      Vector3<LD> v{};
      switch (S::layout) {
        case SampleLayout::delta_angles:
          v = truth_delta_angle(m, static_cast<LD>(j) * dt, static_cast<LD>(j + 1) * dt);
          break;
        case SampleLayout::delta_angles_with_previous:
          v = j == 0 ? Vector3<LD>{0, 0, 0}
                     : truth_delta_angle(m, static_cast<LD>(j - 1) * dt, static_cast<LD>(j) * dt);
          break;
        case SampleLayout::rate_at_end:
          v = m.rate(static_cast<LD>(k + 1) * dt);
          break;
        default:
          v = m.rate(static_cast<LD>(j) * dt);
          break;
      }
      in[i] = narrow<float>(v);
      in_d[i] = {in[i].x, in[i].y, in[i].z};
    }
    const float step = static_cast<float>(dt * static_cast<LD>(periods));
    const Quaternion<float> delta = S::template increment<float>(in, step).delta;
    const Quaternion<double> delta_d = S::template increment<double>(in_d, step).delta;
    as_is = A::advanced(as_is, delta);
    renormalize(as_is);
    add_as_two_floats(exact_product, widen_d(exact_product.hi) * widen_d(delta));
    renormalize(exact_product);
    const Quaternion<double> pair = widen_d(double_increment.hi) + widen_d(double_increment.lo);
    add_as_two_floats(double_increment, pair * delta_d);
    renormalize(double_increment);
    in_double = FirstOrderRenormalization{}.apply(in_double + in_double * delta_d);
  }
  const Quaternion<LD> truth = frame * m.attitude(static_cast<LD>(samples) * dt);
  const auto error = [&](const A::State<float>& st) {
    return angle_between(widen(A::attitude(st)), truth);
  };
  std::printf("| `%s` | %.2Le | %.2Le | %.2Le | %.2Le |\n", S::name, error(as_is),
              error(exact_product), error(double_increment),
              angle_between(widen(in_double), truth));
}

void sources(LD minutes) {
  std::printf(
      "single-axis hover (0.01 rad at 120 Hz about body x), one start attitude, %.1Lf min at "
      "2 kHz, first-order renormalization; error against the truth at the end (rad)\n",
      minutes);
  std::printf(
      "| stepper | compensated float | + exact product q_hi x delta | + delta formed in double | "
      "double, float samples |\n|---|---:|---:|---:|---:|\n");
  rounding_sources<ExponentialMapHoldEnd>(minutes);
  rounding_sources<Coning2Sample>(minutes);
  rounding_sources<Coning3Sample>(minutes);
  rounding_sources<Magnus4>(minutes);
  rounding_sources<RungeKutta4Sampled>(minutes);
}

}  // namespace

int main(int argc, char** argv) {
  std::string what = "all";
  LD minutes = 20;
  int attitudes = 20;
  bool minutes_given = false;
  for (int i = 1; i < argc; ++i) {
    const std::string a = argv[i];
    if (a == "--minutes" && i + 1 < argc) {
      minutes = std::strtold(argv[++i], nullptr);
      minutes_given = true;
    } else if (a == "--attitudes" && i + 1 < argc) {
      attitudes = std::atoi(argv[++i]);
    } else if (a == "demo" || a == "hover" || a == "all" || a == "sources") {
      what = a;
    } else {
      std::fprintf(stderr, "usage: %s [demo|hover|all|sources] [--minutes M] [--attitudes N]\n",
                   argv[0]);
      return 2;
    }
  }
  if (!(minutes > 0) || attitudes < 1) {
    std::fprintf(stderr, "--minutes must be positive and --attitudes at least 1\n");
    return 2;
  }
  if (what == "demo" || what == "all") {
    demo();
  }
  if (what == "hover" || what == "all") {
    hover(minutes, attitudes);
  }
  if (what == "sources") {
    sources(minutes_given ? minutes : 2);
  }
  return 0;
}
