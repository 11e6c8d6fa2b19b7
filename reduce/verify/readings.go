package verify

import (
	"fmt"
	"math"
)

// Series names one run of a force verification: the three increasing
// series 1, 2 and 3, and the decreasing run that follows series 3.
type Series uint8

// The series of an ISO 7500-1 verification.
const (
	Series1 Series = 1
	Series2 Series = 2
	Series3 Series = 3
	// Decreasing is the run from the top back down after series 3, written
	// "r" in the readings file; reversibility compares it with series 3.
	Decreasing Series = 4
)

// String gives the series as the readings file writes it.
func (s Series) String() string {
	switch s {
	case Series1, Series2, Series3:
		return string(rune('0' + s))
	case Decreasing:
		return "r"
	}
	return fmt.Sprintf("Series(%d)", uint8(s))
}

// ParseSeries reads "1", "2", "3" or "r" (also "R").
func ParseSeries(s string) (Series, error) {
	switch s {
	case "1":
		return Series1, nil
	case "2":
		return Series2, nil
	case "3":
		return Series3, nil
	case "r", "R":
		return Decreasing, nil
	}
	return 0, fmt.Errorf("%w: %q (want 1, 2, 3 or r)", ErrBadSeries, s)
}

// Reading is one reading of a force verification: at reference force
// ReferenceN (from the force-proving instrument) the frame indicated
// IndicatedN.
type Reading struct {
	Series     Series
	ReferenceN float64
	IndicatedN float64
}

// check tells why a reading cannot be used, or nil.
func (r Reading) check() error {
	if r.Series < Series1 || r.Series > Decreasing {
		return fmt.Errorf("%w: %d", ErrBadSeries, uint8(r.Series))
	}
	if math.IsNaN(r.ReferenceN) || math.IsInf(r.ReferenceN, 0) || r.ReferenceN <= 0 {
		return fmt.Errorf("%w: reference force %v N must be positive and finite", ErrBadNumber, r.ReferenceN)
	}
	if math.IsNaN(r.IndicatedN) || math.IsInf(r.IndicatedN, 0) {
		return fmt.Errorf("%w: indicated force %v N must be finite", ErrBadNumber, r.IndicatedN)
	}
	return nil
}
