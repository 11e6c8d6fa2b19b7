// Package drivers holds the contract between framed and its sensor drivers:
// the plain Driver interface, its named errors, and the go-plugin shims that
// run every driver, built in or external, in a process of its own so that a
// crashing driver never takes the daemon down.
//
// Subpackages: conformance (the harness every driver passes), builtin (the
// registry of drivers shipped in the framed binary), and one folder per
// driver (sim, lineserial, modbusrtu, replay).
package drivers
