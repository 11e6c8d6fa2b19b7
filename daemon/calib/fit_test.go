package calib

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

func relNear(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

func TestFitSpanByHand(t *testing.T) {
	// Worked by hand (ordinary least squares, common practice):
	// points (0,0) (1,1) (2,1) (3,3): mean x 1.5, mean y 1.25,
	// Sxx = 2.25 + 0.25 + 0.25 + 2.25 = 5,
	// Sxy = 1.875 + 0.125 - 0.125 + 2.625 = 4.5,
	// gain = 4.5 / 5 = 0.9, offset = 1.25 - 0.9 x 1.5 = -0.1.
	// Residuals fit - reference: -0.1, -0.2, +0.7, -0.4; SSR = 0.7;
	// standard error sqrt(0.7 / (4 - 2)) = 0.591607978...
	refs := []Reference{{0, 0, 0}, {1, 1, 0}, {1, 2, 0}, {3, 3, 0}}
	f, err := FitSpan(refs, 1)
	if err != nil {
		t.Fatal(err)
	}
	if !relNear(f.Model.Gain, 0.9, 1e-12) || !relNear(f.Model.Offset, -0.1, 1e-12) || f.Model.Quad != 0 {
		t.Errorf("model %+v, want offset -0.1 gain 0.9", f.Model)
	}
	want := []float64{-0.1, -0.2, 0.7, -0.4}
	for i, r := range f.Residuals {
		if !relNear(r.Residual, want[i], 1e-12) {
			t.Errorf("residual %d = %v, want %v", i, r.Residual, want[i])
		}
	}
	if f.Residuals[0].Pct != nil {
		t.Error("residual at a zero reference has a percentage")
	}
	if p := f.Residuals[3].Pct; p == nil || !relNear(*p, -40/3.0, 1e-12) { // 100 x -0.4 / 3
		t.Errorf("residual %% at 3 = %v, want -13.333", p)
	}
	if f.StdErr == nil || !relNear(*f.StdErr, math.Sqrt(0.35), 1e-12) {
		t.Errorf("std err %v, want sqrt(0.35)", f.StdErr)
	}
}

// loadCellCounts is an invented 24-bit bridge channel: 0 to 50 kN on about
// 2.1 M counts with a slight non-linearity and a few counts of noise, in a
// fixed pseudo-random pattern so the test is repeatable.
func loadCellCounts() []Reference {
	var refs []Reference
	noise := []float64{3, -2, 5, -4, 1, 0, -3, 2, 4, -1, -5}
	for i := 0; i <= 10; i++ {
		forceN := 5000 * float64(i)
		counts := 8123 + 42.1*forceN - 1.3e-5*forceN*forceN + noise[i]
		refs = append(refs, Reference{Reference: forceN, Indicated: counts})
	}
	return refs
}

// TestFitSpanLinearMatchesGonum cross-checks the linear fit against
// gonum's stat.LinearRegression (reference library).
func TestFitSpanLinearMatchesGonum(t *testing.T) {
	refs := loadCellCounts()
	x := make([]float64, len(refs))
	y := make([]float64, len(refs))
	for i, r := range refs {
		x[i], y[i] = r.Indicated, r.Reference
	}
	alpha, beta := stat.LinearRegression(x, y, nil, false)
	f, err := FitSpan(refs, 1)
	if err != nil {
		t.Fatal(err)
	}
	if !relNear(f.Model.Offset, alpha, 1e-8) || !relNear(f.Model.Gain, beta, 1e-10) {
		t.Errorf("ours offset %.12g gain %.12g; gonum %.12g %.12g", f.Model.Offset, f.Model.Gain, alpha, beta)
	}
	var ssr float64
	for i := range x {
		r := alpha + beta*x[i] - y[i]
		ssr += r * r
	}
	if se := math.Sqrt(ssr / float64(len(x)-2)); !relNear(*f.StdErr, se, 1e-6) {
		t.Errorf("std err %v, gonum-based %v", *f.StdErr, se)
	}
}

// TestFitSpanQuadraticMatchesGonum cross-checks the quadratic fit against a
// least-squares solve with gonum/mat (QR of the design matrix). The design
// matrix columns are scaled by 1e6 counts so gonum works on a
// well-conditioned problem; scaling columns does not change the
// least-squares solution, only its units.
func TestFitSpanQuadraticMatchesGonum(t *testing.T) {
	refs := loadCellCounts()
	const s = 1e6
	n := len(refs)
	X := mat.NewDense(n, 3, nil)
	Y := mat.NewDense(n, 1, nil)
	for i, r := range refs {
		u := r.Indicated / s
		X.Set(i, 0, 1)
		X.Set(i, 1, u)
		X.Set(i, 2, u*u)
		Y.Set(i, 0, r.Reference)
	}
	var c mat.Dense
	if err := c.Solve(X, Y); err != nil {
		t.Fatal(err)
	}
	want := Model{Offset: c.At(0, 0), Gain: c.At(1, 0) / s, Quad: c.At(2, 0) / (s * s)}
	f, err := FitSpan(refs, 2)
	if err != nil {
		t.Fatal(err)
	}
	if !relNear(f.Model.Gain, want.Gain, 1e-7) || !relNear(f.Model.Quad, want.Quad, 1e-6) || math.Abs(f.Model.Offset-want.Offset) > 1e-3 {
		t.Errorf("ours %+v, gonum %+v", f.Model, want)
	}
	// Predictions agree to well under a millinewton over the range.
	for _, r := range refs {
		if d := f.Model.Apply(r.Indicated) - want.Apply(r.Indicated); math.Abs(d) > 1e-3 {
			t.Errorf("at %v counts: ours - gonum = %v N", r.Indicated, d)
		}
	}
	// The quadratic fit must beat the linear one on curved data.
	lin, err := FitSpan(refs, 1)
	if err != nil {
		t.Fatal(err)
	}
	if !(*f.StdErr < *lin.StdErr) {
		t.Errorf("quadratic std err %v not below linear %v", *f.StdErr, *lin.StdErr)
	}
}

func TestFitSpanErrors(t *testing.T) {
	two := []Reference{{0, 100, 0}, {1000, 4300, 0}}
	cases := []struct {
		name   string
		refs   []Reference
		degree int
		want   error
	}{
		{"degree 3", two, 3, ErrBadDegree},
		{"degree 0", two, 0, ErrBadDegree},
		{"one point", two[:1], 1, ErrTooFewPoints},
		{"quadratic on two", two, 2, ErrTooFewPoints},
		{"same reading", []Reference{{0, 5, 0}, {10, 5, 0}}, 1, ErrSingular},
		{"two distinct of three for quadratic", []Reference{{0, 5, 0}, {10, 5, 0}, {20, 7, 0}}, 2, ErrSingular},
		{"NaN", []Reference{{0, 5, 0}, {math.NaN(), 6, 0}}, 1, ErrBadValue},
	}
	for _, c := range cases {
		if _, err := FitSpan(c.refs, c.degree); !errors.Is(err, c.want) {
			t.Errorf("%s: err %v, want %v", c.name, err, c.want)
		}
	}
	// Exactly p points: a fit, but no standard error.
	f, err := FitSpan(two, 1)
	if err != nil || f.StdErr != nil {
		t.Errorf("two points: %v, std err %v", err, f.StdErr)
	}
}
