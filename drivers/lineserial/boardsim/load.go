package boardsim

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"sync"
	"time"
)

// StandardGravity is the conventional acceleration of gravity in m/s2
// (3rd CGPM, 1901), used to turn hung masses into forces unless the local
// value is given.
const StandardGravity = 9.80665

// ForceSource gives the force on the simulated cell now.
type ForceSource interface {
	ForceN() float64
}

// Load is the force of the reference weights currently hung, changed by
// the technician or a script while the board reads it. Safe for
// concurrent use; the zero value is an unloaded cell.
type Load struct {
	mu     sync.Mutex
	forceN float64
}

// ForceN is the force hung now.
func (l *Load) ForceN() float64 {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.forceN
}

// Set hangs forceN.
func (l *Load) Set(forceN float64) {
	l.mu.Lock()
	l.forceN = forceN
	l.mu.Unlock()
}

// ParseLoad reads a load as the technician types it: a mass in kg ("12.5"
// or "12.5kg") turned into a force at gravity gMS2, or a force in N
// ("122.6N"). "0", "off" and "unload" take every weight off.
func ParseLoad(s string, gMS2 float64) (forceN float64, err error) {
	t := strings.ToLower(strings.TrimSpace(s))
	switch t {
	case "off", "unload":
		return 0, nil
	}
	unitN := false
	switch {
	case strings.HasSuffix(t, "kg"):
		t = strings.TrimSpace(strings.TrimSuffix(t, "kg"))
	case strings.HasSuffix(t, "n"):
		t = strings.TrimSpace(strings.TrimSuffix(t, "n"))
		unitN = true
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%w: %q is not a mass in kg (12.5) or a force in N (122.6N)", ErrBadLoad, s)
	}
	if unitN {
		return v, nil
	}
	if v < 0 {
		return 0, fmt.Errorf("%w: %q: a hung mass cannot be negative (give a force in N to push)", ErrBadLoad, s)
	}
	return v * gMS2, nil
}

// Step is one entry of a load script: hang ForceN for Hold.
type Step struct {
	ForceN float64
	Hold   time.Duration
}

// ParseScript reads "LOAD:DURATION,..." such as "0:5s,10:5s,122.6N:2s"
// (loads as ParseLoad reads them, durations as time.ParseDuration).
func ParseScript(s string, gMS2 float64) ([]Step, error) {
	var steps []Step
	for i, item := range strings.Split(s, ",") {
		item = strings.TrimSpace(item)
		load, dur, ok := strings.Cut(item, ":")
		if !ok {
			return nil, fmt.Errorf("%w: step %d %q: want LOAD:DURATION", ErrBadScript, i+1, item)
		}
		f, err := ParseLoad(load, gMS2)
		if err != nil {
			return nil, fmt.Errorf("%w: step %d: %w", ErrBadScript, i+1, err)
		}
		d, err := time.ParseDuration(strings.TrimSpace(dur))
		if err != nil || d <= 0 {
			return nil, fmt.Errorf("%w: step %d: duration %q must be positive (5s, 500ms)", ErrBadScript, i+1, dur)
		}
		steps = append(steps, Step{ForceN: f, Hold: d})
	}
	return steps, nil
}

// Play hangs each step's load for its hold time and returns when the
// script ends (the last load stays hung) or ctx is done.
func (l *Load) Play(ctx context.Context, steps []Step) error {
	for _, s := range steps {
		l.Set(s.ForceN)
		t := time.NewTimer(s.Hold)
		select {
		case <-ctx.Done():
			t.Stop()
			return ctx.Err()
		case <-t.C:
		}
	}
	return nil
}

// Control reads load commands, one a line, from in and echoes what is
// hung to out, until "q" or "quit" (returns nil) or the end of in
// (returns io.EOF). A line it cannot read is answered with the reason and
// changes nothing. Control does not watch ctx while blocked on in; the
// caller stops the board itself.
func (l *Load) Control(in io.Reader, out io.Writer, gMS2 float64) error {
	sc := bufio.NewScanner(in)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		switch strings.ToLower(line) {
		case "":
			continue
		case "q", "quit", "exit":
			return nil
		}
		f, err := ParseLoad(line, gMS2)
		if err != nil {
			fmt.Fprintf(out, "%v\n", err)
			continue
		}
		l.Set(f)
		fmt.Fprintf(out, "hung %.6g N (%.6g kg at g = %g m/s2)\n", f, f/gMS2, gMS2)
	}
	if err := sc.Err(); err != nil {
		return fmt.Errorf("load commands: %w", err)
	}
	return io.EOF
}
