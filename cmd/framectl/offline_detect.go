package main

import "framed/reduce"

// detectOffline runs the event detector over a recorded curve so that an
// offline reduction reports the same events, holds and unloads the daemon
// would have published. Placeholder until the detector lands.
func detectOffline(c reduce.Curve) reduce.Detected { return reduce.Detected{} }
