// Package builtin is the registry of the drivers shipped inside the framed
// binary, and the switch that makes that binary serve one of them.
//
// Process model: the daemon never runs a driver in its own process. For a
// built-in driver it starts its own executable again with the arguments
// [DriverModeArg, name] (see Command); that child calls ServeArgs first
// thing in main, finds the driver in the registry and serves it over the
// go-plugin shims. One binary thus deploys every built-in driver, and a
// crashing driver only takes its child down.
//
// Driver packages register themselves in init:
//
//	func init() { builtin.Register("sim", New) }
//
// and the framed main imports them for that side effect. This package must
// never import a driver package.
package builtin
