/* halfspin's C interface (C99): attitude propagation from gyro samples for C firmware.
 *
 * One propagator lives in caller-owned storage of fixed size (halfspin_propagator_f for float,
 * halfspin_propagator_d for double): no heap, no exceptions, no global state. The functions are
 * implemented by one C++ translation unit (halfspin_c.cpp, target halfspin::c) that runs the C++
 * Propagator<T, Stepper, Renormalization, Accumulation> of the chosen configuration, so a sample
 * pushed here gives the same bits as the same sample pushed to that C++ propagator. c/README.md
 * lists the configurations and shows a complete program.
 *
 * Conventions (the library's): attitude quaternion body -> reference, scalar first (w, x, y, z),
 * Hamilton product; rates are body-frame angular velocity in rad/s; a delta-angle is the integral
 * of the rate over its sample interval, in rad; intervals in seconds, or in timer ticks of the
 * tick period given at init. Euler angles in radians, intrinsic sequences (zyx: yaw, pitch, roll).
 *
 * Every function returns a halfspin_status. The first seven are the C++ library's Status values
 * (a rejection leaves the attitude and the sample history bit-for-bit unchanged and is counted);
 * the others are the C interface's own argument errors: nothing is changed and nothing counted. */
#ifndef HALFSPIN_C_H
#define HALFSPIN_C_H

#include <stddef.h>
#include <stdint.h>

#ifdef __cplusplus
extern "C" {
#endif

typedef enum halfspin_status {
  HALFSPIN_OK = 0,                  /* a step was taken */
  HALFSPIN_WAITING_FOR_SAMPLES = 1, /* the sample was accepted; the stepper needs more */
  HALFSPIN_NON_FINITE = 2,          /* NaN or infinity in the sample or the interval */
  HALFSPIN_NON_POSITIVE_STEP = 3,   /* interval <= 0 (or zero ticks) */
  HALFSPIN_STEP_TOO_LONG = 4,       /* interval above max_step: a gap (missed samples) */
  HALFSPIN_OVER_RANGE = 5,          /* a rate (or the mean rate of a delta-angle) above max_rate */
  HALFSPIN_NO_TICK_PERIOD = 6,      /* ticks pushed to a propagator without a usable tick period */
  /* The C interface's own errors: nothing changed, nothing counted. */
  HALFSPIN_INVALID_ARGUMENT = 64,          /* a null pointer, an unknown Euler sequence, or an
                                              initial attitude that is not finite and non-zero */
  HALFSPIN_UNSUPPORTED_CONFIGURATION = 65, /* init: not one of the configurations listed below */
  HALFSPIN_WRONG_INPUT_KIND = 66, /* a rate pushed to a delta-angle stepper, or the reverse */
  HALFSPIN_NOT_INITIALIZED = 67   /* storage that init did not set up (zero it first) */
} halfspin_status;

/* Steppers, numbered as in the library's stepper catalogue (stable ids, never reused). */
typedef enum halfspin_stepper {
  HALFSPIN_EXPONENTIAL_MAP_HOLD_END = 0,      /* rates: one rate at the step's end, order 1 */
  HALFSPIN_EXPONENTIAL_MAP_MIDPOINT_MEAN = 1, /* rates: two spanning the step, order 2 */
  HALFSPIN_MAGNUS_4 = 2,                      /* rates: three spanning the step, order 4 */
  HALFSPIN_CONING_1_SAMPLE = 14,              /* delta-angles: one per step, order 2 */
  HALFSPIN_CONING_2_SAMPLE = 5,               /* delta-angles: two per step, order 4 */
  HALFSPIN_CONING_3_SAMPLE = 18,              /* delta-angles: three per step, order 4 (6 coning) */
  HALFSPIN_CONING_4_SAMPLE = 6                /* delta-angles: four per step, order 4 (8 coning) */
} halfspin_stepper;

typedef enum halfspin_renormalization {
  HALFSPIN_RENORMALIZATION_FIRST_ORDER = 0, /* one Newton step, no square root (the default) */
  HALFSPIN_RENORMALIZATION_EXACT = 1        /* divide by the norm */
} halfspin_renormalization;

typedef enum halfspin_accumulation {
  HALFSPIN_ACCUMULATION_DEFAULT =
      0, /* the library's default: compensated in float, plain in double */
  HALFSPIN_ACCUMULATION_PLAIN = 1,      /* q + q*delta rounded */
  HALFSPIN_ACCUMULATION_COMPENSATED = 2 /* the attitude as an unevaluated pair (float accuracy) */
} halfspin_accumulation;

/* What a stepper's samples are: halfspin_push_rate_* or halfspin_push_delta_angle_*. */
typedef enum halfspin_input_kind {
  HALFSPIN_INPUT_UNKNOWN = 0, /* not a stepper of this interface */
  HALFSPIN_INPUT_RATE = 1,
  HALFSPIN_INPUT_DELTA_ANGLE = 2
} halfspin_input_kind;

/* Euler sequences, in the library's order (intrinsic; first, third in (-pi, pi]; second in
 * [-pi/2, pi/2] for Tait-Bryan, [0, pi] for proper Euler sequences). */
typedef enum halfspin_euler_sequence {
  HALFSPIN_EULER_XYZ = 0,
  HALFSPIN_EULER_XZY = 1,
  HALFSPIN_EULER_YXZ = 2,
  HALFSPIN_EULER_YZX = 3,
  HALFSPIN_EULER_ZXY = 4,
  HALFSPIN_EULER_ZYX = 5, /* aerospace 3-2-1: yaw, pitch, roll */
  HALFSPIN_EULER_XYX = 6,
  HALFSPIN_EULER_XZX = 7,
  HALFSPIN_EULER_YXY = 8,
  HALFSPIN_EULER_YZY = 9,
  HALFSPIN_EULER_ZXZ = 10, /* 3-1-3 */
  HALFSPIN_EULER_ZYZ = 11
} halfspin_euler_sequence;

/* A configuration: scalar type (the _f or _d functions) aside, what init builds. */
typedef struct halfspin_configuration {
  halfspin_stepper stepper;
  halfspin_renormalization renormalization;
  halfspin_accumulation accumulation;
} halfspin_configuration;

/* What happened so far (the library's PropagationCounters). */
typedef struct halfspin_counters {
  uint64_t samples_accepted;
  uint64_t steps;
  uint64_t rejected_non_finite;
  uint64_t rejected_non_positive_step;
  uint64_t rejected_step_too_long;
  uint64_t rejected_over_range;
  uint64_t rejected_no_tick_period;
  uint64_t discarded_samples; /* dropped from a partly filled window after a gap */
  uint64_t elapsed_ticks;     /* ticks accepted through the _ticks pushes, exact */
} halfspin_counters;

/* Build-time selection, for flash: compile halfspin_c.cpp with any of HALFSPIN_C_STEPPERS,
 * HALFSPIN_C_RENORMALIZATIONS, HALFSPIN_C_ACCUMULATIONS defined as a mask of HALFSPIN_C_BIT(value)
 * over the enum values above (for instance
 * HALFSPIN_C_STEPPERS=HALFSPIN_C_BIT(HALFSPIN_CONING_2_SAMPLE),
 * HALFSPIN_C_ACCUMULATIONS=HALFSPIN_C_BIT(HALFSPIN_ACCUMULATION_COMPENSATED)); every listed
 * configuration by default. The configurations left out are not compiled, and init refuses them
 * as HALFSPIN_UNSUPPORTED_CONFIGURATION (ACCUMULATION_DEFAULT too, when what it stands for is out).
 */
#define HALFSPIN_C_BIT(value) (1UL << (value))

/* Storage sizes in bytes (halfspin_c.cpp checks every configuration fits, at compile time). */
#define HALFSPIN_PROPAGATOR_F_STORAGE 256
#define HALFSPIN_PROPAGATOR_D_STORAGE 384

/* Opaque, caller-owned storage: static, on the stack or in a struct of yours. Aligned for
 * double and uint64_t. Zero it before init (static storage is) so that use before init is
 * reported as HALFSPIN_NOT_INITIALIZED. It holds no pointer to itself: copying the struct
 * copies the propagator. */
typedef struct halfspin_propagator_f {
  union {
    unsigned char bytes[HALFSPIN_PROPAGATOR_F_STORAGE];
    double align_double;
    uint64_t align_uint64;
  } storage;
} halfspin_propagator_f;

typedef struct halfspin_propagator_d {
  union {
    unsigned char bytes[HALFSPIN_PROPAGATOR_D_STORAGE];
    double align_double;
    uint64_t align_uint64;
  } storage;
} halfspin_propagator_d;

/* ---- Scalar-independent ---------------------------------------------------------------------- */

/* A short, stable name for logs ("ok", "non_finite", ..., "wrong_input_kind"); "unknown" else. */
const char* halfspin_status_name(halfspin_status status);
/* 1 for the statuses that reject a sample or a call (all but OK and WAITING_FOR_SAMPLES). */
int halfspin_is_rejection(halfspin_status status);
/* The stepper's catalogue name ("coning_2_sample", ...), or "unknown". */
const char* halfspin_stepper_name(halfspin_stepper stepper);
/* Whether the stepper takes rates or delta-angles (HALFSPIN_INPUT_UNKNOWN if not listed). */
halfspin_input_kind halfspin_stepper_input(halfspin_stepper stepper);
/* The supported configurations (the same list for float and double): count, and the i-th
 * (0 <= i < count) in *out; HALFSPIN_INVALID_ARGUMENT past the end. */
size_t halfspin_configuration_count(void);
halfspin_status halfspin_configuration_at(size_t index, halfspin_configuration* out);

/* ---- float ----------------------------------------------------------------------------------- */

/* Builds a propagator in *p: starts at initial_wxyz (unit, body -> reference), accepts rates up to
 * max_rate rad/s per axis and intervals up to max_step s (longer: a gap), tick_period s per timer
 * tick for the _ticks pushes (0: none, every tick push is then rejected as NO_TICK_PERIOD). */
halfspin_status halfspin_init_f(halfspin_propagator_f* p, halfspin_configuration configuration,
                                const float initial_wxyz[4], float max_rate, float max_step,
                                float tick_period);
/* One sample covering the interval that ends now: a rate (rad/s) or a delta-angle (rad), over
 * dt seconds or over `ticks` ticks of the tick period. Steps when the stepper's window is full. */
halfspin_status halfspin_push_rate_f(halfspin_propagator_f* p, const float rate[3], float dt);
halfspin_status halfspin_push_delta_angle_f(halfspin_propagator_f* p, const float delta_angle[3],
                                            float dt);
halfspin_status halfspin_push_rate_ticks_f(halfspin_propagator_f* p, const float rate[3],
                                           uint32_t ticks);
halfspin_status halfspin_push_delta_angle_ticks_f(halfspin_propagator_f* p,
                                                  const float delta_angle[3], uint32_t ticks);
/* Re-anchors the attitude (after a gap, or from an external fix) and restarts the history. */
halfspin_status halfspin_reset_f(halfspin_propagator_f* p, const float attitude_wxyz[4]);
/* The attitude after the last step, (w, x, y, z), body -> reference. */
halfspin_status halfspin_attitude_f(const halfspin_propagator_f* p, float out_wxyz[4]);
/* The attitude as Euler angles (rad) of `sequence`: out_angles = (first, second, third);
 * *out_near_singular = 1 when the middle angle is near gimbal lock (first/third ill-defined). */
halfspin_status halfspin_euler_angles_f(const halfspin_propagator_f* p,
                                        halfspin_euler_sequence sequence, float out_angles[3],
                                        int* out_near_singular);
halfspin_status halfspin_counters_f(const halfspin_propagator_f* p, halfspin_counters* out);
/* Seconds propagated (compensated sum of the steps' intervals). */
halfspin_status halfspin_elapsed_seconds_f(const halfspin_propagator_f* p, float* out);
/* The configuration *p was built with (accumulation DEFAULT resolved to PLAIN or COMPENSATED). */
halfspin_status halfspin_configuration_f(const halfspin_propagator_f* p,
                                         halfspin_configuration* out);

/* ---- double: the same, in double ------------------------------------------------------------- */

halfspin_status halfspin_init_d(halfspin_propagator_d* p, halfspin_configuration configuration,
                                const double initial_wxyz[4], double max_rate, double max_step,
                                double tick_period);
halfspin_status halfspin_push_rate_d(halfspin_propagator_d* p, const double rate[3], double dt);
halfspin_status halfspin_push_delta_angle_d(halfspin_propagator_d* p, const double delta_angle[3],
                                            double dt);
halfspin_status halfspin_push_rate_ticks_d(halfspin_propagator_d* p, const double rate[3],
                                           uint32_t ticks);
halfspin_status halfspin_push_delta_angle_ticks_d(halfspin_propagator_d* p,
                                                  const double delta_angle[3], uint32_t ticks);
halfspin_status halfspin_reset_d(halfspin_propagator_d* p, const double attitude_wxyz[4]);
halfspin_status halfspin_attitude_d(const halfspin_propagator_d* p, double out_wxyz[4]);
halfspin_status halfspin_euler_angles_d(const halfspin_propagator_d* p,
                                        halfspin_euler_sequence sequence, double out_angles[3],
                                        int* out_near_singular);
halfspin_status halfspin_counters_d(const halfspin_propagator_d* p, halfspin_counters* out);
halfspin_status halfspin_elapsed_seconds_d(const halfspin_propagator_d* p, double* out);
halfspin_status halfspin_configuration_d(const halfspin_propagator_d* p,
                                         halfspin_configuration* out);

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* HALFSPIN_C_H */
