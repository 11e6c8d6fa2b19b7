// Package verify classes a frame's force measuring system (ISO 7500-1:2018,
// with the ASTM E4 accuracy criterion) and an extensometer (ISO 9513:2012)
// from verification readings.
//
// It is pure computation: readings in, a report out; no files, no clocks.
// ReadReadings and ReadDisplacements only parse an io.Reader the caller
// opened, so `framectl verify` and the daemon's guided verification share
// the same arithmetic.
//
// Caveats:
//   - The tables of class limits (ForceLimits, ExtensometerLimits) are
//     written from memory of ISO 7500-1 and ISO 9513, not read at source.
//     Check them against the standard before relying on a class.
//   - A reading exactly on a limit meets the class. Comparisons allow a
//     relative slack of 1e-9 (Tolerance) so that a value that is on the
//     limit in decimal arithmetic but lands a few ulps above it in binary
//     floating point still meets the class.
//   - This is a self-check of a retrofitted frame. A certified
//     classification needs a verification by an accredited body with
//     calibrated force-proving instruments.
package verify
