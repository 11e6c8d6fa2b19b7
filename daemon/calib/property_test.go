package calib

import (
	"math"
	"testing"

	"pgregory.net/rapid"
)

// Readings that lie exactly on a line or parabola are fitted with
// (numerically) zero residuals, whatever the offset of the raw counts:
// the centring in FitSpan keeps 24-bit counts near 8 M as accurate as
// counts near zero.
func TestPropertyFitRecoversExactModel(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		degree := rapid.IntRange(1, 2).Draw(t, "degree")
		base := rapid.Float64Range(-8e6, 8e6).Draw(t, "base counts")
		spanCounts := rapid.Float64Range(1e3, 4e6).Draw(t, "span counts")
		gain := rapid.Float64Range(1e-4, 1).Draw(t, "N per count")
		if rapid.Bool().Draw(t, "inverted") {
			gain = -gain
		}
		// Non-linearity up to 1 % of the span at full scale.
		curv := rapid.Float64Range(-0.01, 0.01).Draw(t, "curvature")
		if degree == 1 {
			curv = 0
		}
		n := rapid.IntRange(degree+2, 12).Draw(t, "points")
		truth := func(x float64) float64 {
			u := (x - base) / spanCounts
			return gain*spanCounts*(u+curv*u*u) + 7
		}
		refs := make([]Reference, n)
		for i := range refs {
			x := base + spanCounts*float64(i)/float64(n-1)
			refs[i] = Reference{Reference: truth(x), Indicated: x}
		}
		f, err := FitSpan(refs, degree)
		if err != nil {
			t.Fatal(err)
		}
		fullScale := math.Abs(gain * spanCounts)
		for i, r := range f.Residuals {
			if math.Abs(r.Residual) > 1e-9*fullScale {
				t.Fatalf("residual %d = %v of full scale %v", i, r.Residual, fullScale)
			}
		}
		// The expanded raw-unit model agrees with the truth too.
		for _, r := range refs {
			if d := f.Model.Apply(r.Indicated) - r.Reference; math.Abs(d) > 1e-6*fullScale {
				t.Fatalf("model %+v misses %v by %v (full scale %v)", f.Model, r.Indicated, d, fullScale)
			}
		}
	})
}

// After a tare the window's mean reads zero and the gain is unchanged.
func TestPropertyTareZeroes(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		m := Model{
			Offset: rapid.Float64Range(-1e4, 1e4).Draw(t, "offset"),
			Gain:   rapid.Float64Range(1e-4, 1).Draw(t, "gain"),
			Quad:   rapid.Float64Range(-1e-12, 1e-12).Draw(t, "quad"),
		}
		raw := rapid.SliceOfN(rapid.Float64Range(-1e6, 1e6), 2, 50).Draw(t, "raw")
		w, err := Quiet(raw, 0)
		if err != nil {
			t.Fatal(err)
		}
		c, err := NewTare("force", t0, m, w)
		if err != nil {
			t.Fatal(err)
		}
		scale := math.Abs(m.Apply(w.MeanRaw)) + math.Abs(m.Offset) + 1
		if z := c.Apply(w.MeanRaw); math.Abs(z) > 1e-9*scale {
			t.Fatalf("tared reading %v, scale %v", z, scale)
		}
		if c.Model.Gain != m.Gain || c.Model.Quad != m.Quad {
			t.Fatalf("tare changed gain: %+v -> %+v", m, c.Model)
		}
	})
}
