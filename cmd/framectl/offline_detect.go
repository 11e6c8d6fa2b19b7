package main

import (
	"framed/daemon/detect"
	"framed/reduce"
)

// detectOffline runs the event detector over a recorded curve so that an
// offline reduction reports the same events, holds and unloads the daemon
// would have published. The force range is sized from the curve.
func detectOffline(c reduce.Curve) reduce.Detected { return detect.Offline(c, detect.Config{}) }
