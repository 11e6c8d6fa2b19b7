// Package calib turns a channel's raw readings (ADC counts, or N and mm as
// an uncalibrated device reports them) into engineering units, and keeps
// the history of every calibration in the daemon's bbolt store.
//
// A calibration is either a tare (the zero offset, from the mean of a quiet
// window of readings with nothing on the load train) or a span (gain, and
// optionally a quadratic term, from a least-squares fit to reference
// weights or forces). Each Calibration carries the whole Model in force
// after it, so the newest one in the history is all the daemon needs.
//
// The math takes every time from the caller (no clocks inside), so fits and
// staleness checks are repeatable in tests.
//
// Caveats:
//   - Reference weights become forces through the local acceleration of
//     gravity. Standard gravity (9.80665 m/s2) is a convention; the real
//     value differs by up to about 0.5 % between the equator and the poles,
//     more than a class 0.5 force channel may err in all. Use the local
//     value (common practice), or NormalGravity from the site's latitude.
//   - A calibration here is the lab's own; it does not replace a
//     verification of the force measuring system by an accredited body.
package calib
