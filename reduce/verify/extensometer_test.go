package verify

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"
)

// Worked examples of ISO 9513:2012 classes, by hand. Each limit is the
// larger of a percentage of the reference and an absolute value; the class
// table (ExtensometerLimits) is FROM MEMORY, and every expected class below
// depends on it.
func TestClassifyExtensometer(t *testing.T) {
	cases := []struct {
		d          Displacement
		resMM      float64
		wantBiasUM float64
		want       Class
		why        string
	}{
		{Displacement{1.000, 1.0015}, 0.0001, 1.5, Class02,
			"bias 1.5 um <= class 0.2 max(0.2 % x 1 mm = 2 um, 0.6 um) = 2 um; res 0.1 um <= max(1 um, 0.2 um)"},
		{Displacement{0.100, 0.1015}, 0.0001, 1.5, Class05,
			"bias 1.5 um > class 0.2 max(0.2 um, 0.6 um); on class 0.5 max(0.5 um, 1.5 um) = 1.5 um"},
		{Displacement{0.050, 0.0535}, 0.0001, 3.5, Class2,
			"bias 3.5 um > class 1 max(0.5 um, 3 um); within class 2 max(1 um, 6 um)"},
		{Displacement{0.050, 0.0440}, 0.0001, -6, Class2,
			"bias -6 um on class 2's max(1 um, 6 um)"},
		{Displacement{0.050, 0.0439}, 0.0001, -6.1, NoClass,
			"bias -6.1 um beyond class 2's 6 um"},
		{Displacement{0.500, 0.500}, 0.0025, 0, Class1,
			"res 2.5 um > class 0.5 max(0.25 % x 0.5 mm = 1.25 um, 0.5 um); on class 1 max(2.5 um, 1 um)"},
		{Displacement{0.100, 0.100}, 0.0025, 0, NoClass,
			"res 2.5 um > class 2 max(1 % x 0.1 mm = 1 um, 2 um)"},
		{Displacement{0, 0.0006}, 0.0002, 0.6, Class02,
			"zero reference: only the absolute limits apply; bias 0.6 um on class 0.2's 0.6 um, res 0.2 um on 0.2 um"},
	}
	for _, c := range cases {
		rep, err := ClassifyExtensometer([]Displacement{c.d}, c.resMM)
		if err != nil {
			t.Fatal(err)
		}
		p := rep.Points[0]
		if math.Abs(p.BiasUM-c.wantBiasUM) > 1e-9 {
			t.Errorf("%s: bias %v um, want %v", c.why, p.BiasUM, c.wantBiasUM)
		}
		if p.Class != c.want || rep.Class != c.want {
			t.Errorf("%s: class %v (overall %v), want %v; reasons %q", c.why, p.Class, rep.Class, c.want, p.Reasons)
		}
	}
	// Over several points the extensometer's class is the worst point's:
	// classes 0.2, 0.5, 2 from the first three cases -> 2.
	rep, err := ClassifyExtensometer([]Displacement{{1, 1.0015}, {0.1, 0.1015}, {0.05, 0.0535}}, 0.0001)
	if err != nil {
		t.Fatal(err)
	}
	if rep.Class != Class2 {
		t.Errorf("overall class %v, want 2", rep.Class)
	}
	if rep.Points[1].BiasPct == nil || math.Abs(*rep.Points[1].BiasPct-1.5) > 1e-9 {
		t.Errorf("bias %% at 0.1 mm = %v, want 100 x 0.0015 / 0.1 = 1.5", rep.Points[1].BiasPct)
	}
}

func TestClassifyExtensometerErrors(t *testing.T) {
	if _, err := ClassifyExtensometer(nil, 0.001); !errors.Is(err, ErrNoReadings) {
		t.Errorf("no readings: %v", err)
	}
	if _, err := ClassifyExtensometer([]Displacement{{1, 1}}, 0); !errors.Is(err, ErrBadResolution) {
		t.Errorf("zero resolution: %v", err)
	}
	if _, err := ClassifyExtensometer([]Displacement{{math.Inf(1), 1}}, 0.001); !errors.Is(err, ErrBadNumber) {
		t.Errorf("Inf reference: %v", err)
	}
}

func TestReadDisplacements(t *testing.T) {
	got, err := ReadDisplacements(strings.NewReader("reference_mm,indicated_mm\n0.1,0.1015\n-0.5,-0.4998\n"))
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 || got[0] != (Displacement{0.1, 0.1015}) || got[1] != (Displacement{-0.5, -0.4998}) {
		t.Errorf("got %+v", got)
	}
	for _, in := range []string{"", "reference_mm\n1\n", "reference_mm,indicated_mm\n1,x\n", "reference_mm,indicated_mm\n"} {
		if _, err := ReadDisplacements(strings.NewReader(in)); err == nil {
			t.Errorf("%q: no error", in)
		}
	}
}

// FuzzReadDisplacements: any input gives readings or a named error, never
// a panic.
func FuzzReadDisplacements(f *testing.F) {
	for _, s := range []string{
		"", "reference_mm,indicated_mm\n", "reference_mm,indicated_mm\n0.1,0.1015\n1,1.0015\n",
		"reference_mm,indicated_mm\n-1e308,1e308\n", "reference_mm,indicated_mm\n1,\"2\n",
		"series,reference_N,indicated_N\n1,2,3\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, in string) {
		d, err := ReadDisplacements(strings.NewReader(in))
		if err != nil {
			for _, e := range []error{ErrBadHeader, ErrBadLine, ErrBadNumber, ErrNoReadings} {
				if errors.Is(err, e) {
					return
				}
			}
			t.Fatalf("unnamed error %v", err)
		}
		rep, err := ClassifyExtensometer(d, 0.001)
		if err != nil {
			if !errors.Is(err, ErrBadNumber) {
				t.Fatalf("parsed readings rejected with an unnamed error: %v", err)
			}
			return
		}
		if _, err := json.Marshal(rep); err != nil {
			t.Fatalf("report cannot be written: %v", err)
		}
	})
}
