// Package reduce turns a recorded tension test into the properties a test
// report needs (ISO 6892-1, ASTM E8/E8M, ASTM E111, ASTM E646, ISO 10275).
//
// It is pure: a Curve and a Specimen in, a Result out. No files, no clocks,
// no goroutines, so the daemon and `framectl reduce` give the same numbers
// for the same samples, and every method is testable on exact inputs.
package reduce
