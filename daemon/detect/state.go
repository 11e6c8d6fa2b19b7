package detect

// State is where the detector is in a test's life.
type State int

const (
	// Idle: armed, watching the force for a start and learning its noise.
	Idle State = iota
	// Running: a test is under way.
	Running
	// Ended: the test ended (break, or an unload held at zero); Reset arms
	// the detector for the next one.
	Ended
)

// String names the state for logs and status messages.
func (s State) String() string {
	switch s {
	case Idle:
		return "idle"
	case Running:
		return "running"
	case Ended:
		return "ended"
	}
	return "unknown"
}
