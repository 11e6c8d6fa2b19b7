// Package fakedriver is a scripted driver for testing the plugin shims and
// the conformance harness: it streams a counted pattern of samples, may end
// after a number of batches with a chosen error, and fails or "reopens" when
// a fault file appears, which a test can create from another process.
//
// It touches no hardware; its values are a ramp, not a physical signal.
package fakedriver
