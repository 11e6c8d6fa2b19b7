package reduce

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// TestLineMatchesGonum cross-checks the least-squares line and the ASTM
// E111 statistics against gonum's stat.LinearRegression and stat.RSquared
// on the same points: slope, intercept, r^2, and V1 from its formula
// 100 sqrt((1/r^2 - 1)/(K - 2)) (ASTM E111, from memory), which must equal
// 100 x standard error of the slope / slope.
func TestLineMatchesGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, k := range []int{5, 50, 5000} {
		xs := make([]float64, k)
		ys := make([]float64, k)
		var s sums
		for i := range xs {
			// Strain 0.0005..0.002 with offset, stress 200 GPa x strain plus noise.
			xs[i] = 0.0005 + 0.0015*float64(i)/float64(k-1)
			ys[i] = 12 + 200000*xs[i] + 2*rng.NormFloat64()
			s.add(xs[i], ys[i])
		}
		l, ok := s.fit()
		if !ok {
			t.Fatalf("K=%d: no fit", k)
		}
		alpha, beta := stat.LinearRegression(xs, ys, nil, false)
		r2 := stat.RSquared(xs, ys, nil, alpha, beta)
		rel := func(a, b float64) float64 { return math.Abs(a/b - 1) }
		if rel(l.slope, beta) > 1e-9 || math.Abs(l.intercept-alpha) > 1e-6*math.Abs(alpha)+1e-9 {
			t.Errorf("K=%d: slope %v intercept %v, gonum %v %v", k, l.slope, l.intercept, beta, alpha)
		}
		if math.Abs(l.r2-r2) > 1e-9 {
			t.Errorf("K=%d: r2 %v, gonum %v", k, l.r2, r2)
		}
		v1 := 100 * math.Sqrt((1/r2-1)/float64(k-2))
		if rel(l.v1Pct, v1) > 1e-6 {
			t.Errorf("K=%d: V1 %v %%, from gonum's r2 %v %%", k, l.v1Pct, v1)
		}
	}
}

// TestModulusMatchesGonum reduces a curve and refits the reported window's
// points with gonum: the E of the result must be gonum's slope on the same
// points (strain shifted to the fit's origin does not change the slope).
func TestModulusMatchesGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	n := 4000
	c := Curve{}
	for i := 0; i < n; i++ {
		e := 0.01 * float64(i) / float64(n-1)
		s := 200000 * e
		if s > 400 { // elastic-perfectly plastic with a little hardening
			s = 400 + 1000*(e-0.002)
		}
		c.TimeS = append(c.TimeS, float64(i))
		c.ForceN = append(c.ForceN, s*50+rng.NormFloat64()*5)
		c.ExtensionMM = append(c.ExtensionMM, e*50+rng.NormFloat64()*2e-4)
	}
	res, err := Reduce(c, Specimen{S0MM2: 50, L0MM: 50}, Detected{}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if res.Fit == nil {
		t.Fatal("no fit")
	}
	var xs, ys []float64
	// The window is the samples from the first crossing of FromMPa up to
	// (not including) the first crossing of ToMPa.
	in := false
	for i := range c.ForceN {
		s := c.ForceN[i] / 50
		if !in && s >= res.Fit.FromMPa {
			in = true
		}
		if in && s >= res.Fit.ToMPa {
			break
		}
		if in {
			xs = append(xs, c.ExtensionMM[i]/50)
			ys = append(ys, s)
		}
	}
	_, beta := stat.LinearRegression(xs, ys, nil, false)
	var e float64
	for _, q := range res.Quantities {
		if q.Symbol == "E" {
			e = q.Value * 1000
		}
	}
	if len(xs) != res.Fit.Points || math.Abs(e/beta-1) > 1e-6 {
		t.Errorf("E %v MPa over %d points, gonum %v over %d", e, res.Fit.Points, beta, len(xs))
	}
}

// TestQuadraticMatchesGonum cross-checks the quadratic fit behind the
// elastic window's bend test against gonum's least-squares solve
// (mat.Dense.Solve, QR) of the same design matrix.
func TestQuadraticMatchesGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	k := 200
	var s sums
	design := mat.NewDense(k, 3, nil)
	y := mat.NewVecDense(k, nil)
	for i := 0; i < k; i++ {
		x := 0.001 + 0.004*float64(i)/float64(k-1)
		v := 5 + 200000*x - 4e6*x*x + rng.NormFloat64()
		s.add(x, v)
		design.Set(i, 0, 1)
		design.Set(i, 1, x)
		design.Set(i, 2, x*x)
		y.SetVec(i, v)
	}
	a, b, c, ok := solve3([5]float64{s.n, s.sx, s.sxx, s.sx3, s.sx4}, [3]float64{s.sy, s.sxy, s.sx2y})
	if !ok {
		t.Fatal("no solution")
	}
	var beta mat.VecDense
	if err := beta.SolveVec(design, y); err != nil {
		t.Fatal(err)
	}
	for i, got := range []float64{a, b, c} {
		if want := beta.AtVec(i); math.Abs(got-want) > 1e-6*math.Abs(want) {
			t.Errorf("coefficient %d: %v, gonum %v", i, got, want)
		}
	}
}
