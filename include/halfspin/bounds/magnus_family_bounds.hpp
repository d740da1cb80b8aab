#pragma once
// A-priori local (one-step) error bounds for the exponential-map steps, the fourth-order Magnus
// step and the delta-angle coning algorithms, from a RateEnvelope (D_k ≥ ‖dᵏω/dtᵏ‖ on the step).
//
// LocalErrorBound<S>::local(e, h) (rad) bounds the angle between the attitude the stepper returns
// and the exact one after ONE step of length h (s) started from the exact attitude, for every rate
// whose derivatives obey e on the step (for ConingOneSamplePlusPrevious also on the previous
// sample period, which its estimate reads). It is +∞ when a needed D_k is +∞, when D0·h > 1 rad,
// or when the bound itself reaches 2 rad (outside the range of the derivation below).
//
// Derivation (ours; the inputs are the Magnus expansion and Bortz's rotation-vector equation, see
// REFERENCES.md, and the Peano-kernel quadrature error terms, common practice).
//
// 0. Metric. The error is d(q⊗exp(φ/2), q⊗exp(φ*/2)) = d(exp(φ/2), exp(φ*/2)) ≤ |φ − φ*| for
//    rotation vectors shorter than π: the exponential map's differential has singular values 1 and
//    sin(θ/2)/(θ/2) ≤ 1, so it shortens every segment of the (convex) ball (common practice, no
//    source; checked numerically in the tests). |φ*| ≤ ∫|ω| ≤ X := D0·h ≤ 1, and a bound B < 2
//    keeps |φ| ≤ X + B < π.
// 1. Split. Let α(t) = ∫₀ᵗω, β = ½∫₀ʰ α×ω dt. Bortz's equation φ̇ = ω + ½φ×ω + f(|φ|)φ×(φ×ω),
//    f(x) = (1 − (x/2)cot(x/2))/x², gives φ*(h) = α(h) + β + R. A method computes φ = α̂ + β̂, so
//    |φ − φ*| ≤ |α̂ − α| + |β̂ − β| + |R|.
// 2. Quadrature |α̂ − α| (rate inputs; delta-angles carry α exactly). The Peano kernels of these
//    rules keep one sign, so the scalar error constants hold for vector ω with D_k in place of
//    |f⁽ᵏ⁾| (common practice, no source): rectangle h²/2·D1, trapezoid h³/12·D2 (or h²/3·D1,
//    from |ω − linear interpolant| ≤ 2D1 t(h − t)/h), midpoint h³/24·D2 (or h²/4·D1), Simpson
//    h⁵/2880·D4. The smaller of two valid forms is used.
// 3. Remainder R. f is increasing with positive Taylor coefficients in x², so on [0, 1]
//    1/12 ≤ f ≤ F := 1/12 + X²/700 (convexity in x², f(1) − 1/12 = 0.0014228…). With ψ = φ − α,
//    |α(t)×ω(t)| ≤ D0·D1·t²/2 (α = tω − ∫sω̇), |φ(t)| ≤ D0 t, Grönwall on
//    ψ̇ = ½(α + ψ)×ω + fφ×(φ×ω) gives |ψ(t)| ≤ g·D0·D1·t³, g = k·e^{kX}/6, k = ½ + F·X (e^y is
//    bounded by its quartic Taylor polynomial plus y⁴/(24(1 − y/5)) to stay constexpr). Then:
//    (a) crude, D0 and D1 only: |R(t)| ≤ r4·D0²·D1·t⁴, r4 = g/8 + F(1/8 + gX/5);
//    (b) fifth order: R = ∫[M + ½R(t)×ω + (f − 1/12)φ×(φ×ω) + (1/12)(φ×(φ×ω) − α×(α×ω))] with
//        M = ½β(t)×ω + (1/12)α×(α×ω). Expanding ω = a + bt + ρ about the step start, the t³ parts
//        of M are ±(t³/24)·(a×b)×a and cancel (the time symmetry that makes the third Magnus term
//        O(h⁵)); what is left is |M| ≤ t⁴·D0·(13/96·D1² + 7/72·D0·D2). Integrating each piece:
//        |R| ≤ h⁵·D0·(13/480·D1² + 7/360·D0·D2) + r4/10·D0³·D1·h⁵ + X(½ + gX)/4200·D0³·D1·h⁵
//              + (g/60·D0³·D1·h⁵ + g/12·D0²·D1²·h⁶ + g²/7·D0³·D1²·h⁷)/12.
//    (c) with D3 as well: expanding (b)'s integrand to t⁴ exactly (ω = a + bt + qt²/2 + ρ₃),
//        the part N = ½β×ω + (1/12)α×(α×ω) + (1/12)α×(β×ω) is t⁴·L + O(t⁵) with
//        L = (a×b)×b/48 + a×(a×q)/144 + |a|²(a×b)/144, so the true h⁵ coefficients of R are
//        D0·D1²/240 + D0²·D2/720 + D0³·D1/720 (by the triangle inequality); the O(t⁵) rest of N
//        is bounded term by term (constants n5, n6, n7 in the code, from the same Taylor
//        remainders), the ψ×(α×ω), ψ×(ψ×ω) and (f − 1/12) terms as in (b), and the terms linear
//        in R (½R×ω, (1/12)α×(R×ω)) by Grönwall: a factor e^{X/2 + X²/24}.
//    The bound uses the smallest of (a), (b), (c). R vanishes at constant rate (every term
//    carries D1).
// 4. Commutator term |β̂ − β|. Without a correction (β̂ = 0): |β| ≤ ½∫|α×ω| ≤ D0·D1·h³/12.
//    With β̂ = Σ c·ℓ_i×ℓ_j over linear functionals ℓ of ω (point samples, or delta-angles, which
//    are integrals over sample intervals): expand about mid-step, ω = m + pτ + qτ²/2 + oτ³/6 + r₄,
//    |r₄| ≤ D4τ⁴/24 (and the shorter expansions with D3, D2 remainders). Exactly,
//    β = m×∫τv + ½∬_{s<t} v(s)×v(t), v = ω − m, whose leading terms are
//    h³/12·m×p + h⁵/480·m×o − h⁵/480·p×q. Writing ℓ = μ0·m + μ1·p + μ2·q + μ3·o + ℓ(r₄) with the
//    moments μ_j = ℓ(τʲ/j!), β̂ has the coefficients κ_p = Σc(μ0ᵢμ1ⱼ − μ0ⱼμ1ᵢ) on m×p, κ_q on
//    m×q, κ_o on m×o and κ_pq = Σc(μ1ᵢμ2ⱼ − μ1ⱼμ2ᵢ) on p×q; each mismatch with the exact
//    coefficient times the matching D-product is a leading term (κ_p = h³/12 for every
//    consistent method; κ_q = 0 for time-symmetric ones), and the remainders are bounded by the
//    absolute moments A_j = ℓ(|τ|ʲ/j!): D0·D4·(H⁶/72 + Σ|c|(|μ0ᵢ|A4ⱼ + |μ0ⱼ|A4ᵢ)) (or, with D3
//    only, D0·D3·(H⁵/15 + Σ|c|(|μ0ᵢ|A3ⱼ + |μ0ⱼ|A3ᵢ)) in place of the m×o and D4 terms),
//    D1·D3·(H⁶/24 + Σ|c|(|μ1ᵢ|A3ⱼ + |μ1ⱼ|A3ᵢ)) and D2²·(H⁶/36 + Σ|c|A2ᵢA2ⱼ), H = h/2. When D3
//    or D4 is unknown, the same expansion stopped at p (remainder |ω − m − pτ| ≤ D2τ²/2) gives
//    |κ_p − h³/12|·D0·D1 + D0·D2·(H⁴/4 + Σ|c|(|μ0ᵢ|A2ⱼ + |μ0ⱼ|A2ᵢ)) + D1·D2·(H⁵/6 +
//    Σ|c|(|μ1ᵢ|A2ⱼ + |μ1ⱼ|A2ᵢ)) + the D2² term; the smaller of the two is used. The
//    moments are computed from the sample geometry below, so each method's constants follow from
//    its own weights (Magnus 4: D0·D3·h⁵/720 + D1·D2·h⁵/120; two-sample coning:
//    D0·D3·h⁵/2880 + D1·D2·h⁵/720; one-plus-previous: a D0·D2·h⁴ term, order 3).
// A zero D_k forces D_{k+1} = … = 0 (a derivative that vanishes on the step has vanishing
// derivatives), so a constant rate with unknown higher derivatives still gets the exact bound 0.
// The κ mismatches are computed in exact rational arithmetic, so a consistent or symmetric
// method's mismatch is exactly 0 in every scalar type.
// Tightness (measured, tests/bounds/test_magnus_family_bounds.cpp, worst bound/error over steps
// from D0·h = 0.9 down by 2⁹): on classical coning at 0.2 rad and two axisymmetric bodies, at most
// 1.5 (hold), 3 (midpoint), 10 (Magnus 4, one-plus-previous), 25–52 (two- to four-sample coning,
// whose coning-specific cancellations an envelope cannot see; worse still at small cone angles).
// Envelopes built as sums of sinusoids are looser (the triangle inequality over components).
// Cost: on the order of a hundred flops, plus a few hundred integer operations for the rational
// coefficients unless the bound is evaluated in a constant expression (it is constexpr).

#include <array>
#include <cstddef>
#include <cstdint>
#include <limits>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/magnus4.hpp"

namespace halfspin {

// Primary template undefined: a stepper without a bound does not compile in bound code.
template <class Stepper>
struct LocalErrorBound;

namespace detail {
namespace magnus_bounds {

template <class T>
constexpr T infinity() noexcept {
  return std::numeric_limits<T>::infinity();
}
template <class T>
constexpr T absolute(T x) noexcept {
  return x < T(0) ? -x : x;
}
template <class T>
constexpr T smaller(T a, T b) noexcept {
  return b < a ? b : a;
}
// a·b where a zero factor makes the product 0 even if the other is +∞: a term bounded by
// |u|·|v| with |u| ≤ 0 is zero whatever is known about v.
template <class T>
constexpr T product(T a, T b) noexcept {
  return (a == T(0) || b == T(0)) ? T(0) : a * b;
}
template <class T>
constexpr T product(T a, T b, T c) noexcept {
  return product(product(a, b), c);
}
template <class T>
constexpr T power(T x, int n) noexcept {
  T r = T(1);
  for (int i = 0; i < n; ++i) {
    r *= x;
  }
  return r;
}
// Upper bound of e^y for 0 ≤ y < 5: Taylor to y³ plus the tail bound y⁴/(24(1 − y/5)).
template <class T>
constexpr T exp_upper(T y) noexcept {
  return T(1) + y * (T(1) + y * (T(0.5) + y * T(1.0L / 6))) + y * y * y * y / (T(24) * (T(1) - y / T(5)));
}

// An exact rational (int64), so that the coefficient mismatches of section 4 are exactly 0 for
// a consistent or symmetric method in every scalar type (in float, rounded weights such as 27/40
// would leave an ε-sized κ_p mismatch whose ε·h³ term swamps the h⁵ bound at small steps).
struct Rational {
  std::int64_t num;
  std::int64_t den;  // > 0
};
constexpr std::int64_t greatest_common_divisor(std::int64_t a, std::int64_t b) noexcept {
  a = a < 0 ? -a : a;
  b = b < 0 ? -b : b;
  while (b != 0) {
    const std::int64_t r = a % b;
    a = b;
    b = r;
  }
  return a == 0 ? 1 : a;
}
constexpr Rational reduced(std::int64_t num, std::int64_t den) noexcept {
  const std::int64_t g = greatest_common_divisor(num, den);
  return den < 0 ? Rational{-num / g, -den / g} : Rational{num / g, den / g};
}
constexpr Rational operator+(Rational a, Rational b) noexcept {
  const std::int64_t g = greatest_common_divisor(a.den, b.den);
  return reduced(a.num * (b.den / g) + b.num * (a.den / g), (a.den / g) * b.den);
}
constexpr Rational operator-(Rational a, Rational b) noexcept { return a + Rational{-b.num, b.den}; }
constexpr Rational operator*(Rational a, Rational b) noexcept {
  const Rational x = reduced(a.num, b.den);
  const Rational y = reduced(b.num, a.den);
  return reduced(x.num * y.num, x.den * y.den);
}
template <class T>
constexpr T to_scalar(Rational r) noexcept {
  return static_cast<T>(r.num) / static_cast<T>(r.den);
}

// Moments of one linear functional ℓ of ω, in units where the step is [−½, ½] (τ = t/h − ½):
// mu[j] = ℓ(τʲ/j!), j = 0..3, exact, and absolute moments abs[j] = ℓ(|τ|ʲ/j!), j = 0..4.
template <class T>
struct SampleMoments {
  std::array<Rational, 4> mu{};
  std::array<T, 5> abs{};
};

// ℓ(ω) = ∫_a^b ω dτ (a delta-angle over [a, b], dimensionless).
template <class T>
constexpr SampleMoments<T> interval_moments(Rational a, Rational b) noexcept {
  SampleMoments<T> s{};
  Rational pa{1, 1}, pb{1, 1};
  std::int64_t factorial = 1;
  const T at = to_scalar<T>(a), bt = to_scalar<T>(b);
  for (int j = 0; j < 5; ++j) {
    factorial *= j + 1;  // (j+1)!
    pa = pa * a;         // a^(j+1)
    pb = pb * b;
    if (j < 4) {
      s.mu[static_cast<std::size_t>(j)] = (pb - pa) * Rational{1, factorial};
    }
    // ∫|τ|ʲ dτ = S(b) − S(a), S(x) = sign(x)|x|^(j+1)/(j+1).
    const T ab = absolute(to_scalar<T>(pb)), aa = absolute(to_scalar<T>(pa));
    const T sb = bt < T(0) ? -ab : ab;
    const T sa = at < T(0) ? -aa : aa;
    s.abs[static_cast<std::size_t>(j)] = (sb - sa) / static_cast<T>(factorial);
  }
  return s;
}

// ℓ(ω) = ω(τ) (a rate sample at dimensionless time τ).
template <class T>
constexpr SampleMoments<T> point_moments(Rational tau) noexcept {
  SampleMoments<T> s{};
  Rational p{1, 1};
  std::int64_t factorial = 1;
  for (int j = 0; j < 5; ++j) {
    if (j > 0) {
      factorial *= j;
      p = p * tau;
    }
    const Rational m = p * Rational{1, factorial};
    if (j < 4) {
      s.mu[static_cast<std::size_t>(j)] = m;
    }
    s.abs[static_cast<std::size_t>(j)] = absolute(to_scalar<T>(m));
  }
  return s;
}

struct WeightedPair {
  std::size_t first;
  std::size_t second;
  Rational weight;  // dimensionless: β̂ ∋ weight·ℓ_first × ℓ_second (rate samples: weight·h²)
};

// |β̂ − β| bound (rad) of section 4 for the scheme's samples and pairs, step h (s); tier 3 is
// the expansion through o (D0..D4), tier 2 the one stopped at p (D0..D2).
template <class T>
struct ConingTermTiers {
  T through_d3;
  T through_d2;
};
template <class T, std::size_t K, std::size_t P>
constexpr ConingTermTiers<T> coning_term_tiers(const std::array<SampleMoments<T>, K>& s,
                                               const std::array<WeightedPair, P>& pairs,
                                               const RateEnvelope<T>& e, T h) noexcept {
  // Exact coefficients of β (H = ½): h³/12, 0, h⁵/480, −h⁵/480 on m×p, m×q, m×o, p×q.
  Rational kp{-1, 12}, kq{0, 1}, ko{-1, 480}, kpq{1, 480};
  T r03 = T(0), r04 = T(0), r13 = T(0), r22 = T(0), r02 = T(0), r12 = T(0);
  for (std::size_t n = 0; n < P; ++n) {
    const SampleMoments<T>& a = s[pairs[n].first];
    const SampleMoments<T>& b = s[pairs[n].second];
    const Rational c = pairs[n].weight;
    kp = kp + c * (a.mu[0] * b.mu[1] - b.mu[0] * a.mu[1]);
    kq = kq + c * (a.mu[0] * b.mu[2] - b.mu[0] * a.mu[2]);
    ko = ko + c * (a.mu[0] * b.mu[3] - b.mu[0] * a.mu[3]);
    kpq = kpq + c * (a.mu[1] * b.mu[2] - b.mu[1] * a.mu[2]);
    const T ac = absolute(to_scalar<T>(c));
    const T a0 = absolute(to_scalar<T>(a.mu[0])), b0 = absolute(to_scalar<T>(b.mu[0]));
    const T a1 = absolute(to_scalar<T>(a.mu[1])), b1 = absolute(to_scalar<T>(b.mu[1]));
    r03 += ac * (a0 * b.abs[3] + b0 * a.abs[3]);
    r04 += ac * (a0 * b.abs[4] + b0 * a.abs[4]);
    r13 += ac * (a1 * b.abs[3] + b1 * a.abs[3]);
    r22 += ac * a.abs[2] * b.abs[2];
    r02 += ac * (a0 * b.abs[2] + b0 * a.abs[2]);
    r12 += ac * (a1 * b.abs[2] + b1 * a.abs[2]);
  }
  const T d0 = e[0], d1 = e[1], d2 = e[2], d3 = e[3], d4 = e[4];
  const T h3 = h * h * h, h4 = h3 * h, h5 = h4 * h, h6 = h5 * h;
  // Remainder constants of the exact side: H⁶/72, H⁵/15, H⁶/24, H⁶/36 (and H⁴/4, H⁵/6 below).
  const T with_d4 = product(absolute(to_scalar<T>(ko)) * h5, d0, d3) +
                    product((T(1.0L / 4608) + r04) * h6, d0, d4);
  const T with_d3 = product((T(1.0L / 480) + r03) * h5, d0, d3);
  const T consistency = product(absolute(to_scalar<T>(kp)) * h3, d0, d1);
  const T squared_d2 = product((T(1.0L / 2304) + r22) * h6, d2, d2);
  const T through_d3 = consistency + product(absolute(to_scalar<T>(kq)) * h4, d0, d2) +
                       smaller(with_d4, with_d3) + product(absolute(to_scalar<T>(kpq)) * h5, d1, d2) +
                       product((T(1.0L / 1536) + r13) * h6, d1, d3) + squared_d2;
  // The expansion stopped at p (remainder with D2): exact side H⁴/4·D0·D2 and H⁵/6·D1·D2.
  const T through_d2 = consistency + product((T(1.0L / 64) + r02) * h4, d0, d2) +
                       product((T(1.0L / 192) + r12) * h5, d1, d2) + squared_d2;
  return {through_d3, through_d2};
}
template <class T, std::size_t K, std::size_t P>
constexpr T coning_term_error(const std::array<SampleMoments<T>, K>& s,
                              const std::array<WeightedPair, P>& pairs, const RateEnvelope<T>& e,
                              T h) noexcept {
  const ConingTermTiers<T> t = coning_term_tiers(s, pairs, e, h);
  return smaller(t.through_d3, t.through_d2);
}

// A zero D_k makes every higher derivative zero (dᵏω ≡ 0 on the step), whatever e says of it.
template <class T>
constexpr RateEnvelope<T> implied(const RateEnvelope<T>& e) noexcept {
  RateEnvelope<T> r = e;
  for (std::size_t k = 1; k < 6; ++k) {
    if (r.derivative[k - 1] == T(0)) {
      r.derivative[k] = T(0);
    }
  }
  return r;
}

// |β| ≤ ½∫|α×ω| ≤ D0·D1·h³/12 (rad): the commutator term a method without correction drops.
template <class T>
constexpr T dropped_coning_term(const RateEnvelope<T>& e, T h) noexcept {
  return product(h * h * h / T(12), e[0], e[1]);
}

// |R| (rad), section 3: the smallest of bounds (a), (b), (c); +∞ if D0·h > 1.
template <class T>
constexpr T bortz_remainder(const RateEnvelope<T>& e, T h) noexcept {
  const T d0 = e[0], d1 = e[1], d2 = e[2], d3 = e[3];
  if (d0 == T(0) || d1 == T(0)) {
    return T(0);  // constant rate (or none): φ stays parallel to ω and R vanishes
  }
  const T x = d0 * h;
  if (!(x <= T(1))) {
    return infinity<T>();
  }
  const T f = T(1.0L / 12) + x * x / T(700);
  const T k = T(0.5) + f * x;
  const T g = k * exp_upper(k * x) / T(6);
  const T r4 = g / T(8) + f * (T(0.125) + g * x / T(5));
  const T h4 = h * h * h * h, h5 = h4 * h, h6 = h5 * h, h7 = h6 * h;
  // (a)
  const T crude = r4 * d0 * d0 * d1 * h4;
  // (b)
  const T d0cube_d1_h5 = d0 * d0 * d0 * d1 * h5;
  const T start_expansion =
      product(h5 * d0, T(13.0L / 480) * d1 * d1 + product(T(7.0L / 360) * d0, d2)) +
      (r4 / T(10) + x * (T(0.5) + g * x) / T(4200) + g / T(720)) * d0cube_d1_h5 +
      (g / T(12) * d0 * d0 * d1 * d1 * h6 + g * g / T(7) * d1 * d0cube_d1_h5 * h * h) / T(12);
  // (c): the exact h⁵ coefficients of R, remainders O(h⁶), Grönwall factor for the R-terms.
  const T z4 = product(T(5.0L / 24) * d0, d3) + product(T(5.0L / 12) * d1, d2);
  const T kk = product(T(2.0L / 3) * d0, d2) + T(0.5) * d1 * d1;
  const T n5 = product(d0 * d1 / T(16), d2) + product(d0 * d0 / T(96), d3) +
               (d0 * z4 + product(d0 * d1 / T(4), d2)) / T(12) + (d0 * d0 * d1 * d1 + d0 * d0 * kk) / T(96);
  const T n6 = product(d0 / T(288), d2, d2) + (product(d0 / T(12), d2, d2) + d1 * z4 / T(2)) / T(12);
  const T n7 = product(d1 / T(288), d2, d2);
  const T leading = d0 * d1 * d1 / T(240) + product(d0 * d0 / T(720), d2) + d0 * d0 * d0 * d1 / T(720);
  const T others = g * d0 * d0 * d1 * d1 * h6 / T(144) + g * g * d1 * d0cube_d1_h5 * h * h / T(84) +
                   x * (T(0.5) + g * x) / T(4200) * d0cube_d1_h5;
  const T magnus_terms = exp_upper(T(0.5) * x + x * x / T(24)) *
                         (leading * h5 + n5 * h6 / T(6) + n6 * h7 / T(7) + n7 * h7 * h / T(8) + others);
  return smaller(crude, smaller(start_expansion, magnus_terms));
}

// Sum of the parts, with the range checks of section 0.
template <class T>
constexpr T finish(const RateEnvelope<T>& e, T h, T sum) noexcept {
  if (!(e[0] * h <= T(1)) || !(sum < T(2))) {
    return infinity<T>();
  }
  return sum;
}

// Samples of an N-delta-angle step (dimensionless intervals of 1/N tiling [−½, ½]), plus, with
// `previous`, the previous interval in front at index 0 (the step is then one period).
template <class T, std::size_t N, bool previous>
constexpr std::array<SampleMoments<T>, N + (previous ? 1 : 0)> delta_angle_samples() noexcept {
  std::array<SampleMoments<T>, N + (previous ? 1 : 0)> s{};
  const std::size_t offset = previous ? 1 : 0;
  if (previous) {
    s[0] = interval_moments<T>(Rational{-3, 2}, Rational{-1, 2});
  }
  const std::int64_t n = static_cast<std::int64_t>(N);
  for (std::size_t i = 0; i < N; ++i) {
    const std::int64_t k = static_cast<std::int64_t>(i);
    // [i/N − ½, (i+1)/N − ½] = [(2i − N)/(2N), (2i + 2 − N)/(2N)]
    s[i + offset] = interval_moments<T>(reduced(2 * k - n, 2 * n), reduced(2 * k + 2 - n, 2 * n));
  }
  return s;
}

// Pairs of a coefficient set: every i < j with weight numerators[j − i − 1]/denominator.
template <std::size_t W, std::size_t S>
constexpr std::array<WeightedPair, (S == 0 ? 0 : S * W - S * (S + 1) / 2)> coning_pairs(
    const ConingCoefficientSet<S>& set) noexcept {
  std::array<WeightedPair, (S == 0 ? 0 : S * W - S * (S + 1) / 2)> p{};
  std::size_t n = 0;
  for (std::size_t m = 1; m <= S; ++m) {
    for (std::size_t i = 0; i + m < W; ++i) {
      p[n] = WeightedPair{i, i + m, reduced(set.numerators[m - 1], set.denominator)};
      ++n;
    }
  }
  return p;
}

// Bound for an N-delta-angle coning step of length h (s) with coefficient set `set`.
template <class T, std::size_t N, std::size_t S>
constexpr T multi_sample_coning(const RateEnvelope<T>& given, T h, const ConingCoefficientSet<S>& set) noexcept {
  const RateEnvelope<T> e = implied(given);
  const T beta = coning_term_error(delta_angle_samples<T, N, false>(), coning_pairs<N>(set), e, h);
  return finish(e, h, beta + bortz_remainder(e, h));
}

}  // namespace magnus_bounds
}  // namespace detail

// q ⊗ exp(ω_end·h/2): rectangle rule h²/2·D1 + dropped |β| + |R|; h = one sample period (s).
template <>
struct LocalErrorBound<ExpMapHoldEnd> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& given, T h) noexcept {
    namespace mb = detail::magnus_bounds;
    const RateEnvelope<T> e = mb::implied(given);
    return mb::finish(e, h, mb::product(h * h / T(2), e[1]) + mb::dropped_coning_term(e, h) +
                                mb::bortz_remainder(e, h));
  }
};

// q ⊗ exp(ω_start·h/2): the same rectangle-rule bound as the end sample; h = one period (s).
template <>
struct LocalErrorBound<ExpMapHoldStart> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& e, T h) noexcept {
    return LocalErrorBound<ExpMapHoldEnd>::local(e, h);
  }
};

// Trapezoid: min(h³/12·D2, h²/3·D1) + dropped |β| + |R|; h = one sample period (s).
template <>
struct LocalErrorBound<ExpMapMidpointMean> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& given, T h) noexcept {
    namespace mb = detail::magnus_bounds;
    const RateEnvelope<T> e = mb::implied(given);
    const T quadrature = mb::smaller(mb::product(h * h * h / T(12), e[2]), mb::product(h * h / T(3), e[1]));
    return mb::finish(e, h, quadrature + mb::dropped_coning_term(e, h) + mb::bortz_remainder(e, h));
  }
};

// Midpoint rule: min(h³/24·D2, h²/4·D1) + dropped |β| + |R|; h = two sample periods (s).
template <>
struct LocalErrorBound<ExpMapMidpointSample> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& given, T h) noexcept {
    namespace mb = detail::magnus_bounds;
    const RateEnvelope<T> e = mb::implied(given);
    const T quadrature = mb::smaller(mb::product(h * h * h / T(24), e[2]), mb::product(h * h / T(4), e[1]));
    return mb::finish(e, h, quadrature + mb::dropped_coning_term(e, h) + mb::bortz_remainder(e, h));
  }
};

// Simpson h⁵/2880·D4 + commutator error of h²/12·ω0×ω2 (section 4) + |R|; h = two periods (s).
template <>
struct LocalErrorBound<Magnus4> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& given, T h) noexcept {
    namespace mb = detail::magnus_bounds;
    const RateEnvelope<T> e = mb::implied(given);
    const std::array<mb::SampleMoments<T>, 2> samples{mb::point_moments<T>(mb::Rational{-1, 2}),
                                                     mb::point_moments<T>(mb::Rational{1, 2})};
    const std::array<mb::WeightedPair, 1> pairs{mb::WeightedPair{0, 1, mb::Rational{1, 12}}};
    const T h5 = h * h * h * h * h;
    return mb::finish(e, h, mb::product(h5 / T(2880), e[4]) + mb::coning_term_error(samples, pairs, e, h) +
                                mb::bortz_remainder(e, h));
  }
};

// φ = Δθ: dropped |β| + |R| (α is exact); h = one sample period (s).
template <>
struct LocalErrorBound<ConingOneSample> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& given, T h) noexcept {
    namespace mb = detail::magnus_bounds;
    const RateEnvelope<T> e = mb::implied(given);
    return mb::finish(e, h, mb::dropped_coning_term(e, h) + mb::bortz_remainder(e, h));
  }
};

// φ = Δθ + 1/12·Δθ_prev×Δθ; h = one sample period (s); e must hold over [−h, h] (previous period).
template <>
struct LocalErrorBound<ConingOneSamplePlusPrevious> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& given, T h) noexcept {
    namespace mb = detail::magnus_bounds;
    const RateEnvelope<T> e = mb::implied(given);
    const T beta = mb::coning_term_error(mb::delta_angle_samples<T, 1, true>(),
                                         mb::coning_pairs<2>(coning_coefficients::one_sample_plus_previous),
                                         e, h);
    return mb::finish(e, h, beta + mb::bortz_remainder(e, h));
  }
};

// Two delta-angles, 2/3·Δθ1×Δθ2; h = two sample periods (s).
template <>
struct LocalErrorBound<ConingTwoSample> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& e, T h) noexcept {
    return detail::magnus_bounds::multi_sample_coning<T, 2>(e, h, coning_coefficients::two_sample);
  }
};

// Three delta-angles, weights 27/40, 9/20; h = three sample periods (s).
template <>
struct LocalErrorBound<ConingThreeSample> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& e, T h) noexcept {
    return detail::magnus_bounds::multi_sample_coning<T, 3>(e, h, coning_coefficients::three_sample);
  }
};

// Three delta-angles, older weights 57/80, 33/80; h = three sample periods (s).
template <>
struct LocalErrorBound<ConingThreeSampleOlder> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& e, T h) noexcept {
    return detail::magnus_bounds::multi_sample_coning<T, 3>(e, h, coning_coefficients::three_sample_older);
  }
};

// Four delta-angles, weights 214/315, 46/105, 18/35; h = four sample periods (s).
template <>
struct LocalErrorBound<ConingFourSample> {
  // Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& e, T h) noexcept {
    return detail::magnus_bounds::multi_sample_coning<T, 4>(e, h, coning_coefficients::four_sample);
  }
};

}  // namespace halfspin
