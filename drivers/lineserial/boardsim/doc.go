// Package boardsim plays a bridge board without hardware: a simulated
// 24-bit load-cell amplifier that prints lineserial firmware lines
// ("t=<micros> f=<counts> x=<counts>*HH") at a fixed rate, for the force
// of whatever reference weights are hung on it at the moment.
//
// The pieces are separate so tests and the technician's simulator
// (framectl simboard) share them: LoadCell turns a force into counts,
// Load holds the force currently hung and is moved by typed commands or a
// script, Board writes the lines to any io.Writer, and Link is a pty pair
// with a stable symlink the driver opens as it would a USB board.
//
// Caveats: the load changes in one step (no swing of the hanger, no
// creep), the noise is white and Gaussian, and the non-linearity is a
// pure quadratic term. That is enough to exercise tare, span and a
// verification; it is not a model of any particular load cell. Link
// needs Linux (pty raw mode through termios ioctls).
package boardsim
