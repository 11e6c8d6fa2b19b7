package reduce_test

import (
	"encoding/binary"
	"errors"
	"math"
	"testing"

	"framed/reduce"
)

func TestReduceNamedErrors(t *testing.T) {
	good := reduce.Curve{TimeS: []float64{0, 1, 2}, ForceN: []float64{0, 10, 5}, ExtensionMM: []float64{0, 0.01, 0.02}}
	sp := reduce.Specimen{S0MM2: 10, L0MM: 50}
	nan := math.NaN()
	cases := []struct {
		name string
		c    reduce.Curve
		sp   reduce.Specimen
		opt  reduce.Options
		want error
	}{
		{"no samples", reduce.Curve{}, sp, reduce.Options{}, reduce.ErrNoSamples},
		{"no force column", reduce.Curve{TimeS: []float64{0}}, sp, reduce.Options{}, reduce.ErrNoForce},
		{"force all NaN", reduce.Curve{TimeS: []float64{0, 1}, ForceN: []float64{nan, nan}}, sp, reduce.Options{}, reduce.ErrNoForce},
		{"force never positive", reduce.Curve{TimeS: []float64{0, 1}, ForceN: []float64{-1, 0}}, sp, reduce.Options{}, reduce.ErrNoForce},
		{"ragged", reduce.Curve{TimeS: []float64{0, 1}, ForceN: []float64{1}}, sp, reduce.Options{}, reduce.ErrRaggedCurve},
		{"no S0", good, reduce.Specimen{L0MM: 50}, reduce.Options{}, reduce.ErrNoSection},
		{"negative d0", good, reduce.Specimen{Shape: reduce.ShapeRound, D0MM: -1, L0MM: 50}, reduce.Options{}, reduce.ErrNoSection},
		{"unknown shape", good, reduce.Specimen{Shape: "hexagon", L0MM: 50}, reduce.Options{}, reduce.ErrNoSection},
		{"tube too thick", good, reduce.Specimen{Shape: reduce.ShapeTube, A0MM: 3, OuterD0MM: 5, L0MM: 50}, reduce.Options{}, reduce.ErrNoSection},
		{"no gauge length", good, reduce.Specimen{S0MM2: 10}, reduce.Options{}, reduce.ErrNoGaugeLength},
		{"bad proof", good, sp, reduce.Options{ProofPct: []float64{-0.2}}, reduce.ErrBadOptions},
		{"bad class", good, sp, reduce.Options{ForceClassPct: math.Inf(1)}, reduce.ErrBadOptions},
		{"bad compliance", good, sp, reduce.Options{ComplianceMMPerN: -1}, reduce.ErrBadOptions},
	}
	for _, tc := range cases {
		_, err := reduce.Reduce(tc.c, tc.sp, reduce.Detected{}, tc.opt)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: err %v, want %v", tc.name, err, tc.want)
		}
	}
	if _, err := reduce.Reduce(good, sp, reduce.Detected{}, reduce.Options{}); err != nil {
		t.Errorf("a tiny curve still reduces (to what it supports): %v", err)
	}
}

// TestCrossSections checks S0 for each shape against the formulas of
// ISO 6892-1 (round pi d0^2/4, rect a0 b0, tube pi a0 (D0 - a0)) and the
// wire's m / (rho Lt).
func TestCrossSections(t *testing.T) {
	cases := []struct {
		sp   reduce.Specimen
		want float64
	}{
		{reduce.Specimen{Shape: reduce.ShapeRound, D0MM: 5.003}, 19.658523},            // 42CrMoS4 46NT71 reported S0
		{reduce.Specimen{Shape: reduce.ShapeRect, A0MM: 5.9913, B0MM: 20.101}, 120.43}, // S355 Zx2 reported S0 120.444 from its own rounding
		{reduce.Specimen{Shape: reduce.ShapeTube, A0MM: 1, OuterD0MM: 10}, math.Pi * 9},
		// 1 m of 1 mm copper wire (8.96 g/cm3) weighs pi/4 x 8.96 g.
		{reduce.Specimen{Shape: reduce.ShapeWire, MassG: math.Pi / 4 * 8.96, TotalLengthMM: 1000, DensityGPerCM3: 8.96}, math.Pi / 4},
		{reduce.Specimen{Shape: reduce.ShapeRound, D0MM: 5, S0MM2: 20}, 20},
	}
	for _, tc := range cases {
		got, err := tc.sp.CrossSectionMM2()
		if err != nil || math.Abs(got/tc.want-1) > 2e-4 {
			t.Errorf("%+v: S0 %v (%v), want %v", tc.sp, got, err, tc.want)
		}
	}
}

// FuzzReduce feeds arbitrary curves (NaN, Inf, negative, constant, time
// going backwards) and specimens: Reduce returns a result or a named
// error, never panics, and a result holds only finite numbers.
func FuzzReduce(f *testing.F) {
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16}, 10.0, 50.0)
	f.Add(make([]byte, 64), 1.0, 1.0)
	f.Fuzz(func(t *testing.T, data []byte, s0, l0 float64) {
		var c reduce.Curve
		for i := 0; i+8 <= len(data); i += 8 {
			v := math.Float64frombits(binary.LittleEndian.Uint64(data[i:]))
			k := i / 8
			c.TimeS = append(c.TimeS, float64(k))
			c.ForceN = append(c.ForceN, v)
			c.ExtensionMM = append(c.ExtensionMM, float64(k%7)*v*1e-6)
			c.CrossheadMM = append(c.CrossheadMM, float64(k)*0.01)
		}
		res, err := reduce.Reduce(c, reduce.Specimen{S0MM2: s0, L0MM: l0}, reduce.Detected{}, reduce.Options{})
		if err != nil {
			return
		}
		for _, q := range res.Quantities {
			if math.IsNaN(q.Value) || math.IsInf(q.Value, 0) || (q.U != nil && (math.IsNaN(*q.U) || math.IsInf(*q.U, 0))) {
				t.Fatalf("non-finite %s %v %v", q.Symbol, q.Value, q.U)
			}
		}
	})
}

// TestReduceShortAndOddCurves runs the reduction over short, flat and
// garbled curves that still pass the input checks.
func TestReduceShortAndOddCurves(t *testing.T) {
	sp := reduce.Specimen{S0MM2: 10, L0MM: 50}
	nan := math.NaN()
	curves := []reduce.Curve{
		{TimeS: []float64{0}, ForceN: []float64{5}},
		{TimeS: []float64{0, 1}, ForceN: []float64{5, 5}, ExtensionMM: []float64{nan, nan}},
		{TimeS: []float64{0, 1, 2, 3}, ForceN: []float64{1, 2, 3, 4}, ExtensionMM: []float64{0, 0, 0, 0}},
		{TimeS: []float64{0, 1, 2, 3}, ForceN: []float64{1, nan, 3, math.Inf(1)}, ExtensionMM: []float64{0, 1, nan, 2}, CrossheadMM: []float64{nan, nan, nan, nan}},
		{TimeS: []float64{3, 2, 1, 0}, ForceN: []float64{1, 2, 3, 1}, ExtensionMM: []float64{0, 0.1, 0.2, 0.3}},
	}
	for i, c := range curves {
		res, err := reduce.Reduce(c, sp, reduce.Detected{Events: []reduce.Event{{Kind: reduce.EventBreak, TimeS: 99}}}, reduce.Options{})
		if err != nil {
			if !errors.Is(err, reduce.ErrNoForce) {
				t.Errorf("curve %d: %v", i, err)
			}
			continue
		}
		if res.Flags == nil || res.Quantities == nil || res.Events == nil || res.Holds == nil || res.Unloads == nil {
			t.Errorf("curve %d: nil list in the result (must be empty, not null)", i)
		}
	}
}
