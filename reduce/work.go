package reduce

import (
	"fmt"
	"math"
	"sort"
)

// strainSource says where the strain column of a reduction came from.
type strainSource int

const (
	fromExtensometer strainSource = iota
	fromCrosshead
)

// work is one reduction's working state: stress and strain on the curve's
// own sample index, plus the landmarks found so far. Strain is a fraction
// (not %), stress in MPa.
type work struct {
	c        Curve
	opt      Options
	sp       Specimen
	s0MM2    float64
	leMM     float64
	l0MM     float64
	n        int
	stress   []float64
	strain   []float64
	source   strainSource
	flags    []string
	iFm      int // index of the maximum force
	fmN      float64
	iBreak   int // last sample before fracture
	iRemoved int // last extensometer sample when it was removed, else -1
	first    int // first sample with finite force and strain
	// elastic fit, on strain already shifted so the line passes the origin
	fit        line
	fitOK      bool
	fitFromMPa float64
	fitToMPa   float64
	eSpreadMPa float64 // spread of E over near-best windows (fit-range effect)
	noiseMPa   float64 // stress noise (standard deviation)
}

func (w *work) flag(f string) {
	for _, g := range w.flags {
		if g == f {
			return
		}
	}
	w.flags = append(w.flags, f)
}

// finite is true for a number that is neither NaN nor infinite (v - v is
// NaN for both), in one comparison on the hot paths.
func finite(v float64) bool { return v-v == 0 }

// newWork checks the input and computes stress.
func newWork(c Curve, sp Specimen, opt Options) (*work, error) {
	n := c.Len()
	if n == 0 {
		return nil, fmt.Errorf("%w: the curve is empty", ErrNoSamples)
	}
	for name, col := range map[string][]float64{"force_N": c.ForceN, "extension_mm": c.ExtensionMM, "crosshead_mm": c.CrossheadMM} {
		if col != nil && len(col) != n {
			return nil, fmt.Errorf("%w: %s has %d samples, time_s %d", ErrRaggedCurve, name, len(col), n)
		}
	}
	if c.ForceN == nil {
		return nil, fmt.Errorf("%w: no force column", ErrNoForce)
	}
	s0, err := sp.CrossSectionMM2()
	if err != nil {
		return nil, err
	}
	le, l0 := sp.gaugeLengths()
	if !(le > 0) || math.IsInf(le, 0) || math.IsInf(l0, 0) {
		return nil, fmt.Errorf("%w: give L0 (and Le when it differs)", ErrNoGaugeLength)
	}
	w := &work{c: c, opt: opt, sp: sp, s0MM2: s0, leMM: le, l0MM: l0, n: n, iRemoved: -1, iFm: -1}
	w.stress = make([]float64, n)
	fm := math.Inf(-1)
	perS0 := 1 / s0 // one division, then a multiplication per sample
	for i, f := range c.ForceN {
		if !finite(f) {
			w.stress[i] = nan
			continue
		}
		w.stress[i] = f * perS0
		if f > fm {
			fm, w.iFm = f, i
		}
	}
	if w.iFm < 0 || !(fm > 0) {
		return nil, fmt.Errorf("%w: no positive finite force", ErrNoForce)
	}
	w.fmN = fm
	return w, nil
}

// indexAtTime is the last sample at or before tS (0 when tS is before the
// first sample).
func (w *work) indexAtTime(tS float64) int {
	i := sort.SearchFloat64s(w.c.TimeS, tS)
	if i < w.n && w.c.TimeS[i] == tS {
		return i
	}
	if i > 0 {
		i--
	}
	return i
}
