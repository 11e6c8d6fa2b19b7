// Package reduce turns a recorded tension test into the properties a test
// report needs (ISO 6892-1, ASTM E8/E8M, ASTM E111, ASTM E646, ISO 10275).
//
// It is pure: a Curve and a Specimen in, a Result out. No files, no clocks,
// no goroutines, so the daemon and `framectl reduce` give the same numbers
// for the same samples, and every method is testable on exact inputs.
//
// # What it computes, and how
//
//   - E: least squares over an elastic window found automatically
//     (modulus.go): every window between two stress levels on the first
//     loading is tried, bent ones are dropped, and the widest whose
//     coefficient of variation of the slope stays near the best wins. The
//     ASTM E111 r^2 and V1 go into Result.Fit. The strain axis is then
//     zeroed where the elastic line meets zero stress (toe and preload).
//   - Rp (any plastic extension), Rt (any total extension), ReH, ReL (the
//     initial transient ignored), Ae, Fm, Rm, Ag, Agt (spike-robust, with
//     the flatness of the top in the uncertainty), At, A (from Lu, else
//     from the extension at fracture less the elastic recovery), Z (from
//     Su, du or au bu), n and K over a stated range, W (work of fracture
//     per unit volume, MJ/m3), and the true curve up to Fm
//     (ComputeStressStrain).
//   - An expanded uncertainty (k=2) for each from the channel classes or
//     calibrations, the dimensions and the fit (uncertainty.go).
//   - Flags (flags.go) for what the data cannot support: no extensometer
//     (E only apparent), extensometer removed (later extension from the
//     crosshead matched at the removal), too few or badly fitting elastic
//     points, a flat maximum, proof extensions not reached.
//
// # Caveats
//
//   - Crosshead strain is corrected only by the compliance the caller
//     passes (Options.ComplianceMMPerN); E from it is apparent.
//   - After an extensometer removal, the crosshead is taken to stretch the
//     gauge length at the rate last seen until Fm and in full after it (the
//     neck inside Le). At from it is an estimate, with a 10 % bound on the
//     carried-on part.
//   - A yield point is recognised by a force drop of at least 0.5 % of the
//     peak, so small drops from a change of test speed at yield (common on
//     frames that switch control mode) can be reported as ReH/ReL. The
//     method strings say what was done.
//   - Uncertainties assume the channels' classes (class 1 by default) when
//     no calibration uncertainty is given; they are estimates, not a
//     laboratory's accredited budget.
package reduce
