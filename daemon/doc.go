// Package daemon is framed itself: it wires the drivers, the store, the
// detector, the reducer and the publisher to the world.
//
// One goroutine per driver supervises its process (a built-in driver is
// framed's own binary in driver mode) and restarts it with backoff. One
// acquisition goroutine merges the drivers' channels onto one time base,
// applies the calibrations, feeds the event detector one batch at a time,
// keeps a pre-trigger history while idle and stores every sample of a
// running test; it never waits on the network. An ended test goes to the
// reducer goroutine, which reads back what was committed (exactly what a
// power cut would have left), reduces it with the same code as `framectl
// reduce`, and stores the result with its outbox entry in one
// transaction; the publisher delivers from the outbox.
//
// The control socket (framed.sock in the state directory, owner and group
// only) answers framectl: status, tests, results, samples, tare, span,
// verification reports and queued specimens.
//
// Caveats: framed only watches. It never commands the frame and is no
// safety interlock. A storage failure closes the running test with what
// was committed and framed keeps watching; tests left open by a crash are
// closed as interrupted and reduced when it starts again.
package daemon
