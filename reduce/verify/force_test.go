package verify

import (
	"errors"
	"math"
	"testing"
)

// The worked examples below are built by hand from the ISO 7500-1:2018
// definitions of q, b, v, f0 and a (clause 6, relative errors in % of the
// reference force F):
//
//	q = 100 (mean(Fi) - F) / F        b = 100 (max(Fi) - min(Fi)) / F
//	v = 100 (Fi' - Fi) / F            f0 = 100 Fi0 / FN       a = 100 r / F
//
// Class limits are those of ForceLimits, which are FROM MEMORY (see
// limits.go); every expected class below depends on that table.

// full builds the three increasing series at F.
func full(F, i1, i2, i3 float64) []Reading {
	return []Reading{{Series1, F, i1}, {Series2, F, i2}, {Series3, F, i3}}
}

func near(t *testing.T, what string, got *float64, want float64) {
	t.Helper()
	if got == nil {
		t.Fatalf("%s = nil, want %v", what, want)
	}
	if math.Abs(*got-want) > 1e-9*math.Max(1, math.Abs(want)) {
		t.Errorf("%s = %.15g, want %v", what, *got, want)
	}
}

func TestWorkedExampleClass05(t *testing.T) {
	// F = 10 kN; series 10.03, 10.04, 10.02 kN; decreasing 10.05 kN;
	// r = 1 N; Fi0 = 2 N.
	//   q  = 100 (10030 - 10000) / 10000            = +0.3 %   (mean 10030)
	//   b  = 100 (10040 - 10020) / 10000            =  0.2 %
	//   v  = 100 (10050 - 10020) / 10000            = +0.3 %   (r minus series 3)
	//   a  = 100 x 1 / 10000                        =  0.01 %
	//   f0 = 100 x 2 / 10000                        =  0.02 %
	// All within class 0.5 (q 0.5, b 0.5, v 0.75, a 0.25, f0 0.05; FROM MEMORY).
	rd := append(full(10000, 10030, 10040, 10020), Reading{Decreasing, 10000, 10050})
	rep, err := ClassifyForce(rd, 1, 2)
	if err != nil {
		t.Fatal(err)
	}
	p := rep.Points[0]
	near(t, "q", p.QPct, 0.3)
	near(t, "b", p.BPct, 0.2)
	near(t, "v", p.VPct, 0.3)
	near(t, "a", &p.APct, 0.01)
	near(t, "f0", &rep.F0Pct, 0.02)
	if p.Class != Class05 {
		t.Errorf("class = %v, want 0.5 (reasons %q)", p.Class, p.Reasons)
	}
	if len(rep.Ranges) != 1 || rep.Ranges[0].Class != Class05 || rep.Ranges[0].FromN != 10000 || rep.Ranges[0].ToN != 10000 {
		t.Errorf("ranges = %+v, want one 10000..10000 N class 0.5", rep.Ranges)
	}
	if !rep.ASTME4Pass {
		t.Errorf("ASTM E4 accuracy: |q| 0.3 %% <= 1 %% must pass; reasons %q", rep.ASTME4Reasons)
	}
}

func TestBoundaryAccuracy(t *testing.T) {
	// ISO 7500-1 gives maximum permissible values: a value on the limit
	// meets the class.
	cases := []struct {
		name       string
		F          float64
		readings   [3]float64
		wantQ      float64
		wantClass  Class
		arithmetic string
	}{
		{"q exactly 1.0 %", 1000, [3]float64{1010, 1010, 1010}, 1.0, Class1,
			"100 (1010 - 1000) / 1000 = 1.0 %: over 0.5, on class 1's 1.0"},
		{"q 1.0001 %", 10000, [3]float64{10100.01, 10100.01, 10100.01}, 1.0001, Class2,
			"100 (10100.01 - 10000) / 10000 = 1.0001 %: over class 1's 1.0, within class 2's 2.0"},
		{"q exactly -0.5 %", 2000, [3]float64{1990, 1990, 1990}, -0.5, Class05,
			"100 (1990 - 2000) / 2000 = -0.5 %: on class 0.5's ±0.5"},
		// 30.27, 30.30, 30.33 have the decimal mean 30.30, so
		// q = 100 x 0.30 / 30 = 1.0 % exactly; in binary floating point it
		// comes out a few ulps above 1.0 and must still meet class 1.
		{"q on 1.0 % after rounding", 30, [3]float64{30.27, 30.30, 30.33}, 1.0, Class1,
			"mean 30.30, q = 100 x 0.30 / 30 = 1.0 %; b = 100 x 0.06 / 30 = 0.2 %"},
		{"q exactly 3.0 %", 100, [3]float64{103, 103, 103}, 3.0, Class3,
			"100 (103 - 100) / 100 = 3.0 %: on class 3's 3.0"},
		{"q 3.01 %", 100, [3]float64{103.01, 103.01, 103.01}, 3.01, NoClass,
			"100 (103.01 - 100) / 100 = 3.01 %: beyond every class"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			// r = 0.01 N keeps a = 100 x 0.01 / F <= 0.01 % out of the way.
			rep, err := ClassifyForce(full(c.F, c.readings[0], c.readings[1], c.readings[2]), 0.01, 0)
			if err != nil {
				t.Fatal(err)
			}
			p := rep.Points[0]
			near(t, "q ("+c.arithmetic+")", p.QPct, c.wantQ)
			if p.Class != c.wantClass {
				t.Errorf("class = %v, want %v (%s); reasons %q", p.Class, c.wantClass, c.arithmetic, p.Reasons)
			}
			if c.name == "q on 1.0 % after rounding" && !(*p.QPct > 1.0) {
				t.Errorf("q = %.17g: this case must land above 1.0 in binary to exercise Tolerance", *p.QPct)
			}
		})
	}
}

func TestReversibility(t *testing.T) {
	// F = 5000 N; series 5010, 5005, 5000 N; r = 0.5 N.
	//   q = 100 (5005 - 5000) / 5000 = 0.1 %; b = 100 x 10 / 5000 = 0.2 %;
	//   a = 100 x 0.5 / 5000 = 0.01 %: class 0.5 on q, b, a.
	cases := []struct {
		decN      float64
		wantV     float64
		wantClass Class
		why       string
	}{
		{5037.5, 0.75, Class05, "v = 100 (5037.5 - 5000) / 5000 = 0.75 %: on class 0.5's ±0.75"},
		{5050, 1.0, Class1, "v = 100 (5050 - 5000) / 5000 = 1.0 %: over 0.75, within class 1's 1.5"},
		{4925, -1.5, Class1, "v = 100 (4925 - 5000) / 5000 = -1.5 %: on class 1's ±1.5"},
		{4770, -4.6, NoClass, "v = 100 (4770 - 5000) / 5000 = -4.6 %: beyond class 3's ±4.5"},
	}
	for _, c := range cases {
		rd := append(full(5000, 5010, 5005, 5000), Reading{Decreasing, 5000, c.decN})
		rep, err := ClassifyForce(rd, 0.5, 0)
		if err != nil {
			t.Fatal(err)
		}
		p := rep.Points[0]
		near(t, "v ("+c.why+")", p.VPct, c.wantV)
		near(t, "q", p.QPct, 0.1)
		near(t, "b", p.BPct, 0.2)
		if p.Class != c.wantClass {
			t.Errorf("%s: class = %v, want %v; reasons %q", c.why, p.Class, c.wantClass, p.Reasons)
		}
	}
	// Without a decreasing reading v is not measured and does not limit.
	rep, err := ClassifyForce(full(5000, 5010, 5005, 5000), 0.5, 0)
	if err != nil {
		t.Fatal(err)
	}
	if rep.Points[0].VPct != nil || rep.Points[0].Class != Class05 {
		t.Errorf("no decreasing run: v = %v, class %v; want nil, 0.5", rep.Points[0].VPct, rep.Points[0].Class)
	}
}

func TestMissingSeries(t *testing.T) {
	// F = 2000 N read in series 1 and 3 only: 2004 and 2002 N.
	//   q = 100 (2003 - 2000) / 2000 = 0.15 %; b = 100 x 2 / 2000 = 0.1 %.
	// ISO 7500-1 classes a force from three series, so the class is null
	// and every range that includes 2000 N is null too. F = 4000 N is
	// complete: 4000, 4004, 3996 N, q = 0, b = 100 x 8 / 4000 = 0.2 %.
	rd := []Reading{{Series1, 2000, 2004}, {Series3, 2000, 2002}}
	rd = append(rd, full(4000, 4000, 4004, 3996)...)
	rep, err := ClassifyForce(rd, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	p := rep.Points[0]
	near(t, "q", p.QPct, 0.15)
	near(t, "b", p.BPct, 0.1)
	if p.Class != NoClass || len(p.Reasons) == 0 {
		t.Errorf("2000 N: class %v reasons %q, want null with a reason", p.Class, p.Reasons)
	}
	if rep.Points[1].Class != Class05 {
		t.Errorf("4000 N: class %v, want 0.5", rep.Points[1].Class)
	}
	// a at 4000 N = 100 x 1 / 4000 = 0.025 %, f0 = 0: range 4000-4000 is 0.5.
	if rep.Ranges[0].Class != NoClass || rep.Ranges[1].Class != Class05 {
		t.Errorf("ranges %+v: want 2000 N null, 4000 N class 0.5", rep.Ranges)
	}
	// A lone series: b needs two readings.
	rep, err = ClassifyForce([]Reading{{Series2, 100, 101}}, 0.01, 0)
	if err != nil {
		t.Fatal(err)
	}
	if rep.Points[0].BPct != nil || rep.Points[0].Class != NoClass {
		t.Errorf("one series: b %v class %v, want nil, null", rep.Points[0].BPct, rep.Points[0].Class)
	}
}

func TestZeroErrorLimitsRanges(t *testing.T) {
	// Points 1, 2, 5, 10 kN, every series exact (q = b = 0), r = 1 N so
	// a = 0.1, 0.05, 0.02, 0.01 %: each point meets class 0.5 (a <= 0.25).
	// Fi0 = 8 N: f0 = 100 x 8 / 10000 = 0.08 %, over class 0.5's 0.05 and
	// within class 1's 0.1 (FROM MEMORY), so every range is class 1.
	var rd []Reading
	for _, F := range []float64{1000, 2000, 5000, 10000} {
		rd = append(rd, full(F, F, F, F)...)
	}
	rep, err := ClassifyForce(rd, 1, 8)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "f0", &rep.F0Pct, 0.08)
	if rep.F0Class != Class1 {
		t.Errorf("f0 class %v, want 1", rep.F0Class)
	}
	for _, r := range rep.Ranges {
		if r.Class != Class1 || r.ToN != 10000 {
			t.Errorf("range %+v: want class 1 up to 10000 N", r)
		}
	}
	// Fi0 = -5 N: f0 = -0.05 %, on class 0.5's ±0.05: every range is 0.5.
	rep, err = ClassifyForce(rd, 1, -5)
	if err != nil {
		t.Fatal(err)
	}
	if rep.F0Class != Class05 || rep.Ranges[0].Class != Class05 {
		t.Errorf("f0 %v class %v, range %v: want -0.05 %%, 0.5, 0.5", rep.F0Pct, rep.F0Class, rep.Ranges[0].Class)
	}
	// Fi0 = 31 N: f0 = 0.31 % beyond class 3's 0.3: no range has a class.
	rep, err = ClassifyForce(rd, 1, 31)
	if err != nil {
		t.Fatal(err)
	}
	if rep.F0Class != NoClass || rep.Ranges[3].Class != NoClass {
		t.Errorf("f0 %v: class %v, top range %v; want null", rep.F0Pct, rep.F0Class, rep.Ranges[3].Class)
	}
}

func TestResolutionLimitsLowForces(t *testing.T) {
	// r = 1 N, exact readings. a = 100 r / F:
	//   F = 50 N: 2.0 % (beyond class 3's 1.5) -> null
	//   F = 100 N: 1.0 % (class 2)   F = 200 N: 0.5 % (class 1)
	//   F = 400 N: 0.25 % (class 0.5)
	// So the ranges from 50, 100, 200, 400 N are null, 2, 1, 0.5: ISO 7500-1's
	// lower limit of a class-1 range is 200 r (common practice restatement
	// of a <= 0.5 %).
	var rd []Reading
	for _, F := range []float64{50, 100, 200, 400} {
		rd = append(rd, full(F, F, F, F)...)
	}
	rep, err := ClassifyForce(rd, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	want := []Class{NoClass, Class2, Class1, Class05}
	for i, r := range rep.Ranges {
		if r.Class != want[i] {
			t.Errorf("range from %v N: class %v, want %v", r.FromN, r.Class, want[i])
		}
	}
	if rep.Points[0].Reasons[0] != "a 2.000 % exceeds class 3 limit 1.5 %" {
		t.Errorf("reason at 50 N = %q", rep.Points[0].Reasons)
	}
}

func TestRangesWorstClassFromPointUp(t *testing.T) {
	// Classes by point (q only, r = 0.01 N, Fi0 = 0):
	//   1000 N: 1015 x3 -> q 1.5 % (class 2)
	//   2000 N: 2002 x3 -> q 0.1 % (class 0.5)
	//   4000 N: 4040 x3 -> q 1.0 % (class 1)
	//   8000 N: 8000 x3 -> q 0   (class 0.5)
	// Ranges (worst from the point up): 2, 1, 1, 0.5.
	var rd []Reading
	for _, p := range [][2]float64{{1000, 1015}, {2000, 2002}, {4000, 4040}, {8000, 8000}} {
		rd = append(rd, full(p[0], p[1], p[1], p[1])...)
	}
	rep, err := ClassifyForce(rd, 0.01, 0)
	if err != nil {
		t.Fatal(err)
	}
	want := []Class{Class2, Class1, Class1, Class05}
	for i, r := range rep.Ranges {
		if r.Class != want[i] || r.ToN != 8000 {
			t.Errorf("range %+v, want class %v to 8000 N", r, want[i])
		}
	}
	// ASTM E4: |q| 1.5 % at 1000 N fails the ±1 % criterion.
	if rep.ASTME4Pass {
		t.Error("ASTM E4 accuracy passed with q = 1.5 % at 1000 N")
	}
}

func TestASTME4(t *testing.T) {
	// Forces 100, 200, 400, 600, 800 | 1000, 2000, 4000, 6000, 8000, 10000 N:
	// decade bands from 100 N: [100, 1000) holds 5, [1000, 10000] holds 6
	// -> at least five per decade (ASTM E4-16 cl. 10). r = 0.5 N: lowest
	// force 100 N >= 200 x 0.5 = 100 N (on the limit, passes). Readings
	// 1 % high everywhere: q = +1.0 %, on ASTM E4's ±1 % (passes).
	forces := []float64{100, 200, 400, 600, 800, 1000, 2000, 4000, 6000, 8000, 10000}
	var rd []Reading
	for _, F := range forces {
		rd = append(rd, full(F, 1.01*F, 1.01*F, 1.01*F)...)
	}
	rep, err := ClassifyForce(rd, 0.5, 0)
	if err != nil {
		t.Fatal(err)
	}
	if !rep.ASTME4Pass {
		t.Errorf("accuracy failed: %q", rep.ASTME4Reasons)
	}
	for _, c := range rep.ASTME4Checks {
		if !c.Pass {
			t.Errorf("check %s failed: %s; reasons %q", c.Name, c.Detail, rep.ASTME4Reasons)
		}
	}
	// Dropping 600 N leaves four forces in the first decade; r = 0.6 N puts
	// the lower limit at 200 x 0.6 = 120 N, above 100 N; one force 1.0001 %
	// off fails accuracy.
	var rd2 []Reading
	for _, F := range forces {
		switch F {
		case 600:
			continue
		case 2000:
			rd2 = append(rd2, full(F, 2020.002, 2020.002, 2020.002)...) // q = 100 x 20.002 / 2000 = 1.0001 %
		default:
			rd2 = append(rd2, full(F, F, F, F)...)
		}
	}
	rep, err = ClassifyForce(rd2, 0.6, 0)
	if err != nil {
		t.Fatal(err)
	}
	if rep.ASTME4Pass {
		t.Error("accuracy passed with q = 1.0001 %")
	}
	failed := map[string]bool{}
	for _, c := range rep.ASTME4Checks {
		failed[c.Name] = !c.Pass
	}
	for _, name := range []string{CheckE4Accuracy, CheckE4PerDecade, CheckE4LowerLimit} {
		if !failed[name] {
			t.Errorf("check %s passed, want failed; reasons %q", name, rep.ASTME4Reasons)
		}
	}
	if len(rep.ASTME4Reasons) != 3 {
		t.Errorf("reasons %q, want one per failed check", rep.ASTME4Reasons)
	}
	// Repeatability (ASTM E4 limit 1 %, from memory): 995, 1000, 1005.1 N
	// at 1000 N give b = 100 x 10.1 / 1000 = 1.01 %: fails, while
	// q = 100 x 0.0333 / 1000 = 0.0033 % passes accuracy.
	rep, err = ClassifyForce(full(1000, 995, 1000, 1005.1), 0.1, 0)
	if err != nil {
		t.Fatal(err)
	}
	if !rep.ASTME4Pass || rep.ASTME4Checks[1].Name != CheckE4Repeatability || rep.ASTME4Checks[1].Pass {
		t.Errorf("checks %+v: want accuracy pass, repeatability fail", rep.ASTME4Checks)
	}
}

func TestClassifyForceErrors(t *testing.T) {
	ok := full(1000, 1000, 1000, 1000)
	cases := []struct {
		name    string
		rd      []Reading
		resN, z float64
		wantErr error
	}{
		{"none", nil, 1, 0, ErrNoReadings},
		{"zero resolution", ok, 0, 0, ErrBadResolution},
		{"NaN resolution", ok, math.NaN(), 0, ErrBadResolution},
		{"Inf zero", ok, 1, math.Inf(1), ErrBadZero},
		{"duplicate", append(full(1000, 1, 2, 3), Reading{Series2, 1000, 4}), 1, 0, ErrDuplicate},
		{"negative reference", []Reading{{Series1, -5, 1}}, 1, 0, ErrBadNumber},
		{"NaN indicated", []Reading{{Series1, 5, math.NaN()}}, 1, 0, ErrBadNumber},
		{"bad series", []Reading{{Series(9), 5, 5}}, 1, 0, ErrBadSeries},
		{"overflowing q", []Reading{{Series1, 1e-300, 1e300}}, 1e-301, 0, ErrBadNumber},
		{"overflowing f0", ok, 1, math.MaxFloat64, ErrBadNumber}, // 100 x MaxFloat64 overflows
	}
	for _, c := range cases {
		_, err := ClassifyForce(c.rd, c.resN, c.z)
		if !errors.Is(err, c.wantErr) {
			t.Errorf("%s: err = %v, want %v", c.name, err, c.wantErr)
		}
	}
}

func TestResolution(t *testing.T) {
	// A steady indicator stepping in 0.1 N: r = 0.1 N. One fluctuating
	// over 1.2 N unloaded: r = 1.2 / 2 + 0.1 = 0.7 N (ISO 7500-1 rule,
	// from memory, worked by hand). A fluctuation of exactly one
	// increment is no fluctuation beyond the increment: r = 0.1 N.
	for _, c := range [][3]float64{{0.1, 0, 0.1}, {0.1, 1.2, 0.7}, {0.1, 0.1, 0.1}} {
		if got := Resolution(c[0], c[1]); math.Abs(got-c[2]) > 1e-12 {
			t.Errorf("Resolution(%v, %v) = %v, want %v", c[0], c[1], got, c[2])
		}
	}
}
