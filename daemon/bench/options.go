package bench

import (
	"fmt"
	"io"
	"os"
	"time"
)

// Modes of a run.
const (
	ModeQuick   = "quick"   // a smoke run of well under a minute (CI)
	ModeDefault = "default" // about three minutes
	ModeLong    = "long"    // 10 kHz acquisition for 30 minutes
)

// Options of a run. The zero value is a default run from the running
// binary in the system's temporary directory.
type Options struct {
	Mode string
	// Self is the binary started as the daemon under measurement (it must
	// call ServeArgs and builtin.ServeArgs first thing). Default: the
	// running executable.
	Self string
	// Dir is where stores and files are written: put it on the disk the
	// daemon's state lives on. Default: os.TempDir(). A fresh directory is
	// made inside and removed afterwards.
	Dir string
	// Mosquitto is the mosquitto binary for the second latency figure;
	// empty: looked up on PATH and in /usr/sbin; "off": skipped.
	Mosquitto string
	// Progress, when set, receives one line per phase.
	Progress io.Writer
}

// plan is how long each phase runs in a mode.
type plan struct {
	ingestWindow   time.Duration // whole-path ingest, steady state
	directSamples  int           // samples appended by each baseline
	reduceSamples  int           // size of the stored test reduced
	latencyWindow  time.Duration // per broker
	cpu1kWindow    time.Duration
	acq10kWindow   time.Duration // memory, CPU, writes at 10 kHz
	commitInterval time.Duration // the daemon's default
	idleS          float64       // sim pause before the test (rss_idle)
}

func (o Options) plan() (plan, error) {
	p := plan{commitInterval: 100 * time.Millisecond, idleS: idleBeforeS}
	switch o.Mode {
	case ModeQuick:
		p.ingestWindow, p.directSamples, p.reduceSamples = 2*time.Second, 500_000, 600_000
		p.latencyWindow, p.cpu1kWindow, p.acq10kWindow = 8*time.Second, 4*time.Second, 6*time.Second
		p.idleS = 1.5
	case "", ModeDefault:
		p.ingestWindow, p.directSamples, p.reduceSamples = 6*time.Second, 4_000_000, 6_000_000
		p.latencyWindow, p.cpu1kWindow, p.acq10kWindow = 40*time.Second, 20*time.Second, 45*time.Second
	case ModeLong:
		p.ingestWindow, p.directSamples, p.reduceSamples = 10*time.Second, 8_000_000, 6_000_000
		p.latencyWindow, p.cpu1kWindow, p.acq10kWindow = 3*time.Minute, 60*time.Second, 30*time.Minute
	default:
		return p, fmt.Errorf("%w: mode %q, want %q, %q or %q", ErrBadOptions, o.Mode, ModeQuick, ModeDefault, ModeLong)
	}
	return p, nil
}

func (o Options) progress(format string, a ...any) {
	if o.Progress != nil {
		fmt.Fprintf(o.Progress, format+"\n", a...)
	}
}

func (o Options) self() (string, error) {
	if o.Self != "" {
		return o.Self, nil
	}
	return os.Executable()
}
