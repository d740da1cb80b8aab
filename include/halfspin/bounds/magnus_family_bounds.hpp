#pragma once
/// @file
/// A-priori local (one-step) error bounds for the exponential-map steps, the fourth-order Magnus
/// step and the delta-angle coning algorithms, from a RateEnvelope (D_k ≥ ‖dᵏω/dtᵏ‖ on the step).
///
/// LocalErrorBound<S>::local(e, h) (rad) bounds the angle between the attitude the stepper returns
/// and the exact one after ONE step of length h (s) started from the exact attitude, for every rate
/// whose derivatives obey e on the step (for Coning1SamplePlusPrevious also on the previous
/// sample period, which its estimate reads). It is +∞ when a needed D_k is +∞, when D0·h > 1 rad,
/// or when the bound itself reaches 2 rad (outside the range of the derivation below).
///
/// Derivation (ours; the inputs are the Magnus expansion and Bortz's rotation-vector equation, see
/// REFERENCES.md, and the Peano-kernel quadrature error terms, common practice).
///
/// 0. Metric. The error is d(q⊗exp(φ/2), q⊗exp(φ*/2)) = d(exp(φ/2), exp(φ*/2)) ≤ |φ − φ*| for
///    rotation vectors shorter than π: the exponential map's differential has singular values 1 and
///    sin(θ/2)/(θ/2) ≤ 1, so it shortens every segment of the (convex) ball (common practice, no
///    source; checked numerically in tests/bounds/test_magnus_family_bounds.cpp, and again in
///    test_runge_kutta_bounds.cpp and test_roundoff_floor.cpp; the RKMK4 bound and the roundoff
///    floor rely on it too). |φ*| ≤ ∫|ω| ≤ X := D0·h ≤ 1, and a bound B < 2
///    keeps |φ| ≤ X + B < π.
/// 1. Split. Let α(t) = ∫₀ᵗω, β = ½∫₀ʰ α×ω dt. Bortz's equation (Bortz 1971) for the rotation
///    vector of the step, φ̇ = dexp⁻¹_φ(ω) = ω + ½φ×ω + f(|φ|)φ×(φ×ω),
///    f(x) = (1 − (x/2)cot(x/2))/x² (its series and bounds in §3), gives φ*(h) = α(h) + β + R. A
///    method computes φ = α̂ + β̂, so |φ − φ*| ≤ |α̂ − α| + |β̂ − β| + |R|. (The derivation lives
///    here; other headers state the equation they use in a line and cite this section.)
/// 2. Quadrature |α̂ − α| (rate inputs; delta-angles carry α exactly). The Peano kernels of these
///    rules keep one sign, so the scalar error constants hold for vector ω with D_k in place of
///    |f⁽ᵏ⁾| (common practice, no source): rectangle h²/2·D1, trapezoid h³/12·D2 (or h²/3·D1,
///    from |ω − linear interpolant| ≤ 2D1 t(h − t)/h), midpoint h³/24·D2 (or h²/4·D1), Simpson
///    h⁵/2880·D4. The smaller of two valid forms is used.
/// 3. Remainder R. The coefficient f: with z = x/2, z·cot z = 1 − z²/3 − z⁴/45 − 2z⁶/945 − …
///    (Bernoulli numbers; common practice, no source; coefficients from memory), so
///    f(x) = 1/12 + x²/720 + x⁴/30240 + …, every Taylor coefficient in x² positive and the ratio
///    of successive ones rising to 1/(2π)² < 1/39. Hence f is increasing, and on [0, 1]
///    f(x) − 1/12 ≤ x²/720 + (x⁴/30240)/(1 − x²/39) (the RKMK4 bound's majorant,
///    runge_kutta_bounds.hpp (B); tests/bounds/test_runge_kutta_bounds.cpp checks it against the
///    closed form) and 1/12 ≤ f ≤ F := 1/12 + X²/700 (convexity in x²,
///    f(1) − 1/12 = 0.0014228…). With ψ = φ − α, |α(t)×ω(t)| ≤ D0·D1·t²/2 (α = tω − ∫sω̇),
///    |φ(t)| ≤ D0 t, Grönwall on
///    ψ̇ = ½(α + ψ)×ω + fφ×(φ×ω) gives |ψ(t)| ≤ g·D0·D1·t³, g = k·e^{kX}/6, k = ½ + F·X (e^y is
///    bounded by its quartic Taylor polynomial plus y⁴/(24(1 − y/5)) to stay constexpr). Then:
///    (a) crude, D0 and D1 only: |R(t)| ≤ r4·D0²·D1·t⁴, r4 = g/8 + F(1/8 + gX/5);
///    (b) fifth order: R = ∫[M + ½R(t)×ω + (f − 1/12)φ×(φ×ω) + (1/12)(φ×(φ×ω) − α×(α×ω))] with
///        M = ½β(t)×ω + (1/12)α×(α×ω). Expanding ω = a + bt + ρ about the step start, the t³ parts
///        of M are ±(t³/24)·(a×b)×a and cancel (the time symmetry that makes the third Magnus term
///        O(h⁵)); what is left is |M| ≤ t⁴·D0·(13/96·D1² + 7/72·D0·D2). Integrating each piece:
///        |R| ≤ h⁵·D0·(13/480·D1² + 7/360·D0·D2) + r4/10·D0³·D1·h⁵ + X(½ + gX)/4200·D0³·D1·h⁵
///              + (g/60·D0³·D1·h⁵ + g/12·D0²·D1²·h⁶ + g²/7·D0³·D1²·h⁷)/12.
///    (c) with D3 as well: expanding (b)'s integrand to t⁴ exactly (ω = a + bt + qt²/2 + ρ₃),
///        the part N = ½β×ω + (1/12)α×(α×ω) + (1/12)α×(β×ω) is t⁴·L + O(t⁵) with
///        L = (a×b)×b/48 + a×(a×q)/144 + |a|²(a×b)/144, so the true h⁵ coefficients of R are
///        D0·D1²/240 + D0²·D2/720 + D0³·D1/720 (by the triangle inequality); the O(t⁵) rest of N
///        is bounded term by term (constants n5, n6, n7 in the code, from the same Taylor
///        remainders), the ψ×(α×ω), ψ×(ψ×ω) and (f − 1/12) terms as in (b), and the terms linear
///        in R (½R×ω, (1/12)α×(R×ω)) by Grönwall: a factor e^{X/2 + X²/24}.
///    The bound uses the smallest of (a), (b), (c). R vanishes at constant rate (every term
///    carries D1).
/// 4. Commutator term |β̂ − β|. Without a correction (β̂ = 0): |β| ≤ ½∫|α×ω| ≤ D0·D1·h³/12.
///    With β̂ = Σ c·ℓ_i×ℓ_j over linear functionals ℓ of ω (point samples, or delta-angles, which
///    are integrals over sample intervals): expand about mid-step, ω = m + pτ + qτ²/2 + oτ³/6 + r₄,
///    |r₄| ≤ D4τ⁴/24 (and the shorter expansions with D3, D2 remainders). Exactly,
///    β = m×∫τv + ½∬_{s<t} v(s)×v(t), v = ω − m, whose leading terms are
///    h³/12·m×p + h⁵/480·m×o − h⁵/480·p×q. Writing ℓ = μ0·m + μ1·p + μ2·q + μ3·o + ℓ(r₄) with the
///    moments μ_j = ℓ(τʲ/j!), β̂ has the coefficients κ_p = Σc(μ0ᵢμ1ⱼ − μ0ⱼμ1ᵢ) on m×p, κ_q on
///    m×q, κ_o on m×o and κ_pq = Σc(μ1ᵢμ2ⱼ − μ1ⱼμ2ᵢ) on p×q; each mismatch with the exact
///    coefficient times the matching D-product is a leading term (κ_p = h³/12 for every
///    consistent method; κ_q = 0 for time-symmetric ones), and the remainders are bounded by the
///    absolute moments A_j = ℓ(|τ|ʲ/j!): D0·D4·(H⁶/72 + Σ|c|(|μ0ᵢ|A4ⱼ + |μ0ⱼ|A4ᵢ)) (or, with D3
///    only, D0·D3·(H⁵/15 + Σ|c|(|μ0ᵢ|A3ⱼ + |μ0ⱼ|A3ᵢ)) in place of the m×o and D4 terms),
///    D1·D3·(H⁶/24 + Σ|c|(|μ1ᵢ|A3ⱼ + |μ1ⱼ|A3ᵢ)) and D2²·(H⁶/36 + Σ|c|A2ᵢA2ⱼ), H = h/2. When D3
///    or D4 is unknown, the same expansion stopped at p (remainder |ω − m − pτ| ≤ D2τ²/2) gives
///    |κ_p − h³/12|·D0·D1 + D0·D2·(H⁴/4 + Σ|c|(|μ0ᵢ|A2ⱼ + |μ0ⱼ|A2ᵢ)) + D1·D2·(H⁵/6 +
///    Σ|c|(|μ1ᵢ|A2ⱼ + |μ1ⱼ|A2ᵢ)) + the D2² term; the smaller of the two is used. The
///    moments are computed from the sample geometry below, so each method's constants follow from
///    its own weights (Magnus 4: D0·D3·h⁵/720 + D1·D2·h⁵/120; two-sample coning:
///    D0·D3·h⁵/2880 + D1·D2·h⁵/720; one-plus-previous: a D0·D2·h⁴ term, order 3).
/// A zero D_k forces D_{k+1} = … = 0 (a derivative that vanishes on the step has vanishing
/// derivatives), so a constant rate with unknown higher derivatives still gets the exact bound 0.
/// The κ mismatches are computed in exact rational arithmetic, so a consistent or symmetric
/// method's mismatch is exactly 0 in every scalar type.
/// Tightness (measured, tests/bounds/test_magnus_family_bounds.cpp, worst bound/error over steps
/// from D0·h = 0.9 down by 2⁹): on classical coning at 0.2 rad and two axisymmetric bodies, at most
/// 1.5 (hold), 3 (midpoint), 10 (Magnus 4, one-plus-previous), 25–52 (two- to four-sample coning,
/// whose coning-specific cancellations an envelope cannot see; worse still at small cone angles).
/// Envelopes built as sums of sinusoids are looser (the triangle inequality over components).
/// Cost: on the order of a hundred flops, plus a few hundred integer operations for the rational
/// coefficients unless the bound is evaluated in a constant expression (it is constexpr).

#include <array>
#include <cstddef>
#include <cstdint>
#include <limits>

#include "halfspin/bounds/local_error_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/propagation/rotation_vector_family.hpp"

namespace halfspin {

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
  return T(1) + y * (T(1) + y * (T(0.5) + y * T(1.0L / 6))) +
         y * y * y * y / (T(24) * (T(1) - y / T(5)));
}

using detail::interval_moments;
using detail::point_moments;
using detail::Rational;
using detail::reduced;
using detail::SampleMoments;
using detail::to_scalar;
using detail::WeightedPair;

// Bounds of the products |x_i|·|y_j| of the expansion pieces of section 4 (x_i, y_j: the parts of
// ω of derivative order i, j). For one rate, D_i·D_j. For the cross part of the bilinear forms β
// and β̂ between two rates u and v (B(u, v) + B(v, u), mixed_motion_bound.hpp), the pieces are
// linear in the rate, so every term x_i(u + v) × y_j(u + v) leaves x_i(u) × y_j(v) + x_i(v) ×
// y_j(u): Du_i·Dv_j + Dv_i·Du_j (the polarization of the same bound).
template <class T>
struct PairProducts {
  RateEnvelope<T> u;
  RateEnvelope<T> v;
  bool cross;
  constexpr T operator()(std::size_t i, std::size_t j) const noexcept {
    return cross ? product(u[i], v[j]) + product(v[i], u[j]) : product(u[i], u[j]);
  }
};
template <class T>
constexpr PairProducts<T> single(const RateEnvelope<T>& e) noexcept {
  return {e, e, false};
}
template <class T>
constexpr PairProducts<T> crossed(const RateEnvelope<T>& u, const RateEnvelope<T>& v) noexcept {
  return {u, v, true};
}

// |β̂ − β| bound (rad) of section 4 for the scheme's samples and pairs, step h (s); tier 3 is
// the expansion through o (D0..D4), tier 2 the one stopped at p (D0..D2). `d(i, j)` bounds the
// products of derivative orders i and j (PairProducts).
template <class T>
struct ConingTermTiers {
  T through_d3;
  T through_d2;
};
template <class T, std::size_t K, std::size_t P>
constexpr ConingTermTiers<T> coning_term_tiers(const std::array<SampleMoments<T>, K>& s,
                                               const std::array<WeightedPair, P>& pairs,
                                               const PairProducts<T>& d, T h) noexcept {
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
  const T h3 = h * h * h, h4 = h3 * h, h5 = h4 * h, h6 = h5 * h;
  // Remainder constants of the exact side: H⁶/72, H⁵/15, H⁶/24, H⁶/36 (and H⁴/4, H⁵/6 below).
  const T with_d4 = product(absolute(to_scalar<T>(ko)) * h5, d(0, 3)) +
                    product((T(1.0L / 4608) + r04) * h6, d(0, 4));
  const T with_d3 = product((T(1.0L / 480) + r03) * h5, d(0, 3));
  const T consistency = product(absolute(to_scalar<T>(kp)) * h3, d(0, 1));
  const T squared_d2 = product((T(1.0L / 2304) + r22) * h6, d(2, 2));
  const T through_d3 = consistency + product(absolute(to_scalar<T>(kq)) * h4, d(0, 2)) +
                       smaller(with_d4, with_d3) +
                       product(absolute(to_scalar<T>(kpq)) * h5, d(1, 2)) +
                       product((T(1.0L / 1536) + r13) * h6, d(1, 3)) + squared_d2;
  // The expansion stopped at p (remainder with D2): exact side H⁴/4·D0·D2 and H⁵/6·D1·D2.
  const T through_d2 = consistency + product((T(1.0L / 64) + r02) * h4, d(0, 2)) +
                       product((T(1.0L / 192) + r12) * h5, d(1, 2)) + squared_d2;
  return {through_d3, through_d2};
}
template <class T, std::size_t K, std::size_t P>
constexpr T coning_term_error(const std::array<SampleMoments<T>, K>& s,
                              const std::array<WeightedPair, P>& pairs, const PairProducts<T>& d,
                              T h) noexcept {
  const ConingTermTiers<T> t = coning_term_tiers(s, pairs, d, h);
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

// |β| ≤ ½∫|α×ω| ≤ D0·D1·h³/12 (rad): the commutator term a method without correction drops
// (α×ω = −(∫₀ᵗ sω̇ ds)×ω, |∫₀ᵗ sω̇| ≤ D1·t²/2). Its cross part between u and v: the t·u×v and
// t·v×u terms cancel, leaving (Du1·Dv0 + Dv1·Du0)·h³/12, the polarized form.
template <class T>
constexpr T dropped_coning_term(const PairProducts<T>& d, T h) noexcept {
  return product(h * h * h / T(12), d(0, 1));
}

// Bound (c) of section 3 in its parts. R = S + K with S = ∫N + O: N the multilinear part
// (½β×ω + (1/12)α×(α×ω) + (1/12)α×(β×ω), degree 3 and 4 in the rate), O the ψ×(α×ω), ψ×(ψ×ω) and
// (f − 1/12) terms, K the terms linear in R. |∫N| ≤ multilinear = leading·h⁵ + n5·h⁶/6 + n6·h⁷/7
// + n7·h⁸/8 (the exact h⁵ coefficients and the Taylor rests, each a term-by-term product bound:
// a polynomial in D0..D3 with non-negative coefficients whose every monomial bounds one
// multilinear term slot by slot); |O| ≤ others; Grönwall gives |R| ≤ grow·(multilinear + others)
// and |K| ≤ (grow − 1)·(multilinear + others). All +∞ when D0·h > 1.
template <class T>
struct RemainderParts {
  T multilinear;  // rad
  T others;       // rad
  T grow;         // the Grönwall factor, ≥ 1
};
template <class T>
constexpr RemainderParts<T> bortz_remainder_parts(const RateEnvelope<T>& e, T h) noexcept {
  const T d0 = e[0], d1 = e[1], d2 = e[2], d3 = e[3];
  const T x = d0 * h;
  if (!(x <= T(1))) {
    return {infinity<T>(), infinity<T>(), infinity<T>()};
  }
  const T f = T(1.0L / 12) + x * x / T(700);
  const T k = T(0.5) + f * x;
  const T g = k * exp_upper(k * x) / T(6);
  const T h4 = h * h * h * h, h5 = h4 * h, h6 = h5 * h, h7 = h6 * h;
  const T d0cube_d1_h5 = d0 * d0 * d0 * d1 * h5;
  // (c): the exact h⁵ coefficients of R, remainders O(h⁶), Grönwall factor for the R-terms.
  const T z4 = product(T(5.0L / 24) * d0, d3) + product(T(5.0L / 12) * d1, d2);
  const T kk = product(T(2.0L / 3) * d0, d2) + T(0.5) * d1 * d1;
  const T n5 = product(d0 * d1 / T(16), d2) + product(d0 * d0 / T(96), d3) +
               (d0 * z4 + product(d0 * d1 / T(4), d2)) / T(12) +
               (d0 * d0 * d1 * d1 + d0 * d0 * kk) / T(96);
  const T n6 =
      product(d0 / T(288), d2, d2) + (product(d0 / T(12), d2, d2) + d1 * z4 / T(2)) / T(12);
  const T n7 = product(d1 / T(288), d2, d2);
  const T leading =
      d0 * d1 * d1 / T(240) + product(d0 * d0 / T(720), d2) + d0 * d0 * d0 * d1 / T(720);
  const T others = g * d0 * d0 * d1 * d1 * h6 / T(144) + g * g * d1 * d0cube_d1_h5 * h * h / T(84) +
                   x * (T(0.5) + g * x) / T(4200) * d0cube_d1_h5;
  const T grow = exp_upper(T(0.5) * x + x * x / T(24));
  const T multilinear = leading * h5 + n5 * h6 / T(6) + n6 * h7 / T(7) + n7 * h7 * h / T(8);
  return {multilinear, others, grow};
}

// |R| (rad), section 3: the smallest of bounds (a), (b), (c); +∞ if D0·h > 1.
template <class T>
constexpr T bortz_remainder(const RateEnvelope<T>& e, T h) noexcept {
  const T d0 = e[0], d1 = e[1], d2 = e[2];
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
  const T h4 = h * h * h * h, h5 = h4 * h, h6 = h5 * h;
  // (a)
  const T crude = r4 * d0 * d0 * d1 * h4;
  // (b)
  const T d0cube_d1_h5 = d0 * d0 * d0 * d1 * h5;
  const T start_expansion =
      product(h5 * d0, T(13.0L / 480) * d1 * d1 + product(T(7.0L / 360) * d0, d2)) +
      (r4 / T(10) + x * (T(0.5) + g * x) / T(4200) + g / T(720)) * d0cube_d1_h5 +
      (g / T(12) * d0 * d0 * d1 * d1 * h6 + g * g / T(7) * d1 * d0cube_d1_h5 * h * h) / T(12);
  // (c)
  const RemainderParts<T> c = bortz_remainder_parts(e, h);
  const T magnus_terms = c.grow * (c.multilinear + c.others);
  return smaller(crude, smaller(start_expansion, magnus_terms));
}

// |R(u + v) − R(u)| (rad) for two rates u, v with envelopes eu, ev (s = u + v). With
// K(t) = ∫₀ᵗ [½R×ω + (1/12)α×(R×ω)] the terms linear in R, the difference Δ = R_s − R_u obeys
//   Δ(t) = (S_s − S_u)(t) + ∫₀ᵗ [½Δ×ω_s + (1/12)α_s×(Δ×ω_s)] + ∫₀ᵗ F,
//   F = ½R_u×v + (1/12)(α_v×(R_u×ω_s) + α_u×(R_u×v)),  |F| ≤ |R_u|·Dv0·(½ + (Ds0 + Du0)·t/12),
// so by Grönwall (the same factor grow_s as for R_s) |Δ(h)| ≤ grow_s·(|S_s − S_u| + |R_u|·Dv0·h·
// (½ + (Ds0 + Du0)·h/24)), every bound increasing in t. |S_s − S_u| ≤ the change of the
// multilinear part, multilinear(Ds) − multilinear(Du) (its monomials with at least one v factor:
// the polarization of each product bound; evaluated as a difference, plus 64ε·multilinear(Ds) for
// its rounding: each part is a sum of about 20 rounded products, so either is within 20ε·itself), +
// others(Ds) + others(Du). It vanishes with v except for the O terms, which are O(D0·h) smaller
// than the multilinear ones. Also at most |R_s| + |R_u|; the smaller is returned.
template <class T>
constexpr T bortz_remainder_difference(const RateEnvelope<T>& eu, const RateEnvelope<T>& ev,
                                       T h) noexcept {
  const RateEnvelope<T> es = eu + ev;
  const T own = bortz_remainder(eu, h);
  const T separate = bortz_remainder(es, h) + own;
  const RemainderParts<T> ps = bortz_remainder_parts(es, h);
  const RemainderParts<T> pu = bortz_remainder_parts(eu, h);
  const T change = ps.multilinear > pu.multilinear ? ps.multilinear - pu.multilinear : T(0);
  const T rounding = T(64) * std::numeric_limits<T>::epsilon() * ps.multilinear;
  const T forcing = product(own, ev[0] * h * (T(0.5) + (es[0] + eu[0]) * h / T(24)));
  const T difference = ps.grow * (change + rounding + ps.others + pu.others + forcing);
  return smaller(separate, difference);
}

// Sum of the parts, with the range checks of section 0.
template <class T>
constexpr T finish(const RateEnvelope<T>& e, T h, T sum) noexcept {
  if (!(e[0] * h <= T(1)) || !(sum < T(2))) {
    return infinity<T>();
  }
  return sum;
}

// ∫₀¹|K₀(t)|dt for a rate rule's quadrature on [0, 1], K₀(t) = (1 − t) − Σ_{x_i ≥ t} w_i the
// degree-0 Peano kernel: |α̂ − α| ≤ ∫|K₀|·h²·D1 for any rule (vector ω: the kernel integral form
// holds componentwise in the direction of the error). Exact: K₀ is linear between the nodes.
template <std::size_t W>
constexpr Rational peano_zero(const RotationVectorRule<W>& r) noexcept {
  std::array<Rational, W + 2> cut{};
  std::array<Rational, W> node{};
  for (std::size_t i = 0; i < W; ++i) {
    node[i] = r.layout == SampleLayout::rate_at_end
                  ? Rational{1, 1}
                  : reduced(static_cast<std::int64_t>(i), static_cast<std::int64_t>(W - 1));
  }
  cut[0] = Rational{0, 1};
  for (std::size_t i = 0; i < W; ++i) {
    cut[i + 1] = node[i];
  }
  cut[W + 1] = Rational{1, 1};
  Rational total{0, 1};
  for (std::size_t k = 0; k + 1 < W + 2; ++k) {
    const Rational a = cut[k];
    const Rational b = cut[k + 1];
    if ((b - a).num <= 0) {
      continue;
    }
    Rational held{0, 1};  // Σ w_i over nodes ≥ b
    for (std::size_t i = 0; i < W; ++i) {
      if ((node[i] - b).num >= 0) {
        held = held + reduced(r.quadrature[i], r.quadrature_denominator);
      }
    }
    const Rational c = Rational{1, 1} - held;  // K₀(t) = c − t on (a, b]
    const Rational ca = c - a;
    const Rational cb = c - b;
    const Rational half{1, 2};
    if (ca.num <= 0) {  // c ≤ a: K₀ < 0 on the piece
      total = total + half * (cb * cb - ca * ca);
    } else if (cb.num >= 0) {  // c ≥ b: K₀ ≥ 0
      total = total + half * (ca * ca - cb * cb);
    } else {
      total = total + half * (ca * ca + cb * cb);
    }
  }
  return total;
}

// |E(x^(d+1))|/(d+1)! for the rule's degree d: the integral of its degree-d Peano kernel, which
// is ∫|K_d| when K_d keeps one sign (true of every rate rule of the family; the tests check the
// sign on a dense grid): |α̂ − α| ≤ that·h^(d+2)·D_(d+1).
template <std::size_t W>
constexpr Rational peano_top(const RotationVectorRule<W>& r, int d) noexcept {
  Rational sum{0, 1};
  for (std::size_t i = 0; i < W; ++i) {
    const Rational x =
        r.layout == SampleLayout::rate_at_end
            ? Rational{1, 1}
            : reduced(static_cast<std::int64_t>(i), static_cast<std::int64_t>(W - 1));
    Rational xk{1, 1};
    for (int j = 0; j <= d; ++j) {
      xk = xk * x;
    }
    sum = sum + reduced(r.quadrature[i], r.quadrature_denominator) * xk;
  }
  Rational e = Rational{1, d + 2} - sum;
  std::int64_t factorial = 1;
  for (int j = 2; j <= d + 1; ++j) {
    factorial *= j;
  }
  e = e * Rational{1, factorial};
  return e.num < 0 ? Rational{-e.num, e.den} : e;
}

// |α̂ − α| bound (rad) of a rate rule (section 2 with its constants derived from the weights):
// the smaller of the degree-0 and degree-d Peano forms; 0 for delta-angles (α exact).
template <class T, std::size_t W>
constexpr T quadrature_error(const RotationVectorRule<W>& r, const RateEnvelope<T>& e,
                             T h) noexcept {
  if (!detail::carries_rates(r.layout)) {
    return T(0);
  }
  const int d = detail::quadrature_degree(r);
  const T zero_form = product(to_scalar<T>(peano_zero(r)) * h * h, e[1]);
  if (d < 1 || d > 4) {
    return zero_form;
  }
  T hp = h * h;
  for (int j = 0; j < d; ++j) {
    hp *= h;
  }
  const std::size_t derivative = static_cast<std::size_t>(d) + 1;
  const T top_form = product(to_scalar<T>(peano_top(r, d)) * hp, e[derivative]);
  return smaller(zero_form, top_form);
}

// The commutator part |β̂ − β| (rad) of a member, for the products d (one rate or a cross part).
template <class T, std::size_t W>
constexpr T commutator_error(const RotationVectorRule<W>& r, const PairProducts<T>& d,
                             T h) noexcept {
  return detail::has_commutator(r)
             ? coning_term_error(detail::rule_sample_moments<T>(r), detail::rule_pairs(r), d, h)
             : dropped_coning_term(d, h);
}

// The bound of one step of a member of the family: quadrature, commutator and remainder.
template <class T, std::size_t W>
constexpr T rotation_vector_step(const RotationVectorRule<W>& r, const RateEnvelope<T>& given,
                                 T h) noexcept {
  const RateEnvelope<T> e = implied(given);
  return finish(
      e, h, quadrature_error(r, e, h) + commutator_error(r, single(e), h) + bortz_remainder(e, h));
}

}  // namespace magnus_bounds
}  // namespace detail

/// The one bound of the family: every exponential-map, Magnus and coning stepper, with the
/// constants of sections 2 and 4 computed from its RotationVectorRule; h is the stepper's step
/// (s): one sample period for the one-sample rules, two for the mid-sample and Magnus rules, N for
/// N delta-angles. For Coning1SamplePlusPrevious the envelope must also hold over the previous
/// sample period, which its estimate reads.
template <class Rule>
struct FamilyLocalErrorBound<RotationVectorStepper<Rule>> {
  /// Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& e, T h) noexcept {
    return detail::magnus_bounds::rotation_vector_step(Rule::value, e, h);
  }

  /// For a rate split into cones u_1..u_n, whose own errors the caller has exactly (as rotation
  /// vectors: |φ̂ − φ*| of each cone alone, coning_error.hpp), and a rest v: the bound (rad) of
  /// everything else in |φ̂ − φ*| for the whole rate. Sections 1–4: φ̂ − φ* = (α̂ − α) + (β̂ − β) − R
  /// with α̂ − α linear and β̂ − β bilinear in the rate, so for ω = Σu_j + v
  ///   φ̂ − φ*(ω) = Σ_j (φ̂ − φ*)(u_j) + Σ_j R(u_j) − R(ω) + (α̂ − α)(v)
  ///              + Σ_{j<k} X(u_j, u_k) + X(Σu_j, v) + (β̂ − β)(v, v),
  /// (with |Σ_j R(u_j) − R(ω)| bounded by bortz_remainder_difference: the change the rest makes to
  /// the first cone's R, plus the other cones' own),
  /// X(x, y) = (β̂ − β)(x, y) + (β̂ − β)(y, x), bounded by the polarized products (PairProducts).
  /// The cones–rest term is split once more: v = c + w with c = v at mid-window, a constant
  /// (|c| ≤ Dv0), and w = v − c (|w| ≤ Dv1·half_span, its derivatives v's). X(u_j, c) = M_j × c
  /// exactly (a constant's samples are c times the sample length; mixed_motion_bound.hpp computes
  /// |M_j| in long double), so |X(u_j, c)| ≤ |M_j|·Dv0; X(Σu_j, w) takes the polarized bound.
  /// Returned: |(α̂ − α)(v)| + the X bounds + |(β̂ − β)(v, v)| + Σ_j |R(u_j)| + |R(ω)|, with
  /// `total` any envelope of the whole rate. The caller adds Σ_j |(φ̂ − φ*)(u_j)| and applies
  /// `checked` (section 0's range, from `total`).
  template <class T, std::size_t N>
  static constexpr T split_remainder(const std::array<RateEnvelope<T>, N>& cone,
                                     const std::array<T, N>& constant_cross, std::size_t count,
                                     const RateEnvelope<T>& rest, const RateEnvelope<T>& total, T h,
                                     T half_span) noexcept {
    using namespace detail::magnus_bounds;
    const auto& r = Rule::value;
    const RateEnvelope<T> v = implied(rest);
    T sum = quadrature_error(r, v, h) + commutator_error(r, single(v), h);
    RateEnvelope<T> cones = RateEnvelope<T>::none();
    for (std::size_t j = 0; j < count; ++j) {
      const RateEnvelope<T> u = implied(cone[j]);
      for (std::size_t k = j + 1; k < count; ++k) {
        sum += commutator_error(r, crossed(u, implied(cone[k])), h);
      }
      sum += product(constant_cross[j], v[0]);
      cones = cones + u;
    }
    // |Σ_j R(u_j) − R(ω)|: the first cone's R against the whole rate's (everything else as the
    // second rate), each other cone's R on its own; or |R(ω)| + Σ_j |R(u_j)| with `total`.
    T apart = bortz_remainder(implied(total), h);
    T together = T(0);
    RateEnvelope<T> others = v;
    for (std::size_t j = 0; j < count; ++j) {
      const T own = bortz_remainder(implied(cone[j]), h);
      apart += own;
      if (j > 0) {
        together += own;
        others = others + implied(cone[j]);
      }
    }
    together += count > 0 ? bortz_remainder_difference(implied(cone[0]), others, h) : apart;
    sum += smaller(apart, together);
    RateEnvelope<T> w = v;
    const T drift = product(v[1], half_span);
    w.derivative[0] = smaller(T(2) * v[0], drift);
    return sum + commutator_error(r, crossed(cones, implied(w)), h);
  }
  /// Section 0's range check on a sum (rad): +∞ when D0·h > 1 or the sum reaches 2 rad.
  template <class T>
  static constexpr T checked(const RateEnvelope<T>& total, T h, T sum) noexcept {
    return detail::magnus_bounds::finish(total, h, sum);
  }
};

}  // namespace halfspin
