// Package serialtest holds test helpers for serial drivers: a playback
// port scripted byte for byte, and a real pseudo-terminal pair whose slave
// end a driver opens like a USB serial adapter.
//
// The playback port is for unit tests of a driver's read loop (timeouts,
// errors, resynchronisation) without timing or kernel effects; the pty pair
// is for end-to-end tests through the real serial library and the kernel's
// tty layer, including unplugging and replugging the "board".
//
// Caveats: a pty ignores baud rate, parity and stop bits, so tests over a
// pty prove the byte stream handling, not the electrical framing. The pty
// helper works on Linux (and other systems creack/pty supports).
package serialtest
