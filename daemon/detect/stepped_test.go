package detect

import (
	"encoding/json"
	"flag"
	"math"
	"os"
	"path/filepath"
	"testing"

	"framed/daemon/detect/detectgen"
	"framed/reduce"
	"framed/reduce/curvefile"
)

// The golden stepped cases in testdata/detect/<case>/ are written by
//
//	go test ./daemon/detect -run TestSteppedGolden -update
//
// from detectgen.Wire at the case's sample rate and seed; the checked-in
// files are then the input and expectation, independent of later changes
// to the generator.
var update = flag.Bool("update", false, "rewrite the golden stepped cases in testdata/detect")

type goldenCase struct {
	name   string
	rateHz float64
	seed   uint64
}

var goldenCases = []goldenCase{
	{"wire-10hz", 10, 1}, // the rate of a cheap bridge board at its slow setting
	{"wire-80hz", 80, 2}, // ... and at its fast one
}

// expected is a case's expectation, with tolerances.
type expected struct {
	Generator    string      `json:"generator"`
	ForceRangeN  float64     `json:"force_range_N"`
	ForceTolN    float64     `json:"force_tol_N"`
	ExtTolMM     float64     `json:"extension_tol_mm"`
	SetTolMM     float64     `json:"set_tol_mm"`
	Holds        []expHold   `json:"holds"`
	Unloads      []expUnload `json:"unloads"`
	NoSetUpToN   float64     `json:"no_set_up_to_N"`
	SetFromN     float64     `json:"set_from_N"`
	BreakS       float64     `json:"break_s"`
	BreakTolS    float64     `json:"break_tol_s"`
	SettleWindow float64     `json:"settle_window_s"`
}

type expHold struct {
	ForceN      float64 `json:"force_N"`
	ExtensionMM float64 `json:"extension_mm"`
	// Settled between the weights going on and SettleS plus the settle
	// window; ends by EndS.
	ChangeEndS float64 `json:"change_end_s"`
	SettleS    float64 `json:"settle_s"`
	EndS       float64 `json:"end_s"`
	Creeping   bool    `json:"creeping"`
}

type expUnload struct {
	AfterForceN float64 `json:"after_force_N"`
	SetMM       float64 `json:"set_mm"`
	SettleS     float64 `json:"settle_s"`
}

func writeGolden(t *testing.T, dir string, gc goldenCase) {
	g := detectgen.Wire(gc.rateHz, gc.seed)
	c, tr := g.Generate()
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	f, err := os.Create(filepath.Join(dir, "curve.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if err := curvefile.Write(f, c); err != nil {
		t.Fatal(err)
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	noise := math.Max(g.Sensor.ForceNoiseN, g.Sensor.ForceStepN)
	e := expected{
		Generator:   "detectgen.Wire(" + formatG(gc.rateHz) + ", " + formatG(float64(gc.seed)) + ")",
		ForceRangeN: 1000,
		// The settled force is an average of at least 8 readings of a
		// swing died down to the noise: within 3 noise floors.
		ForceTolN: 3 * noise,
		// The extension creeps by up to ~0.01 mm/s during the window.
		ExtTolMM:     0.02,
		SetTolMM:     0.01,
		NoSetUpToN:   tr.NoSetUpToN,
		SetFromN:     tr.SetFromN,
		BreakS:       tr.FractureS,
		BreakTolS:    0.1,
		SettleWindow: 1.5*DefaultSettleMinS + 2/gc.rateHz,
	}
	for _, h := range tr.Holds {
		e.Holds = append(e.Holds, expHold{h.ForceN, h.ExtensionMM, h.ChangeEndS, h.SettleS, h.EndS, h.Creeping})
	}
	for _, u := range tr.Unloads {
		e.Unloads = append(e.Unloads, expUnload{u.AfterForceN, u.SetMM, u.SettleS})
	}
	b, _ := json.MarshalIndent(e, "", "  ")
	if err := os.WriteFile(filepath.Join(dir, "expected.json"), append(b, '\n'), 0o644); err != nil {
		t.Fatal(err)
	}
}

func formatG(x float64) string { b, _ := json.Marshal(x); return string(b) }

// TestSteppedGolden runs the detector over the stepped dead-weight cases:
// every hold found once with its settled force within the noise, no hold
// reported before the swing has had time to die out (a hanging load swings
// and must be left to settle before reading: common practice), creep only
// under the loads past the elastic limit (in plastic flow the extension
// keeps growing during a hold: common practice), no set after the cycles
// below the elastic limit and set after the first one past it (set appears
// only past the elastic limit: common practice), and the break on the
// final weight.
func TestSteppedGolden(t *testing.T) {
	for _, gc := range goldenCases {
		t.Run(gc.name, func(t *testing.T) {
			dir := filepath.Join("..", "..", "testdata", "detect", gc.name)
			if *update {
				writeGolden(t, dir, gc)
			}
			c := readCurve(t, filepath.Join(dir, "curve.csv"))
			var e expected
			b, err := os.ReadFile(filepath.Join(dir, "expected.json"))
			if err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(b, &e); err != nil {
				t.Fatal(err)
			}
			d, err := New(Config{ForceRangeN: e.ForceRangeN})
			if err != nil {
				t.Fatal(err)
			}
			var ems []Emission
			for i := 0; i < c.Len(); i += 37 { // odd batches: no batch edge is special
				j := min(i+37, c.Len())
				for _, em := range d.Step(c.Slice(i, j)) {
					ems = append(ems, em)
				}
			}
			got := d.Detected()
			checkStepped(t, e, got, ems)
			if d.State() != Ended {
				t.Errorf("state %v after the break, want ended", d.State())
			}
		})
	}
}

func readCurve(t *testing.T, path string) reduce.Curve {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := curvefile.Read(f)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func checkStepped(t *testing.T, e expected, got reduce.Detected, ems []Emission) {
	t.Helper()
	if len(got.Holds) != len(e.Holds) {
		t.Errorf("%d holds, want %d: %+v", len(got.Holds), len(e.Holds), got.Holds)
	}
	for _, eh := range e.Holds {
		n := 0
		for _, h := range got.Holds {
			if math.Abs(h.ForceN-eh.ForceN) > e.ForceTolN || h.SettledS < eh.ChangeEndS || h.SettledS > eh.EndS {
				continue
			}
			n++
			if h.SettledS > eh.SettleS+e.SettleWindow {
				t.Errorf("hold %.0f N settled at %.3f s, want by %.3f s", eh.ForceN, h.SettledS, eh.SettleS+e.SettleWindow)
			}
			if h.SettledS < eh.SettleS-e.SettleWindow {
				t.Errorf("hold %.0f N read at %.3f s while still swinging (settles %.3f s)", eh.ForceN, h.SettledS, eh.SettleS)
			}
			if math.Abs(h.ExtensionMM-eh.ExtensionMM) > e.ExtTolMM {
				t.Errorf("hold %.0f N extension %.4f mm, want %.4f ± %.4f", eh.ForceN, h.ExtensionMM, eh.ExtensionMM, e.ExtTolMM)
			}
			if h.EndS > eh.EndS+0.1 || h.EndS < eh.EndS-1 {
				t.Errorf("hold %.0f N ends %.3f s, want about %.3f s", eh.ForceN, h.EndS, eh.EndS)
			}
			// Creep: well above the extension noise's effect on a slope
			// over several seconds (1e-3 mm/s) when past the limit,
			// below it otherwise.
			if eh.Creeping && h.CreepMMPerS < 1e-3 {
				t.Errorf("hold %.0f N past the elastic limit creeps %.2g mm/s, want a clear creep", eh.ForceN, h.CreepMMPerS)
			}
			if !eh.Creeping && math.Abs(h.CreepMMPerS) > 1e-3 {
				t.Errorf("hold %.0f N below the elastic limit creeps %.2g mm/s, want none", eh.ForceN, h.CreepMMPerS)
			}
		}
		if n != 1 {
			t.Errorf("hold %.0f N found %d times, want once", eh.ForceN, n)
		}
	}
	if len(got.Unloads) != len(e.Unloads) {
		t.Fatalf("unloads %+v, want %+v", got.Unloads, e.Unloads)
	}
	for i, eu := range e.Unloads {
		u := got.Unloads[i]
		if math.Abs(u.AfterForceN-eu.AfterForceN) > e.ForceTolN {
			t.Errorf("unload %d after %.2f N, want %.2f", i, u.AfterForceN, eu.AfterForceN)
		}
		if math.Abs(u.SetMM-eu.SetMM) > e.SetTolMM {
			t.Errorf("unload %d set %.4f mm, want %.4f ± %.4f", i, u.SetMM, eu.SetMM, e.SetTolMM)
		}
	}
	el := got.ElasticLimit
	if el == nil || el.NoSetUpToN == nil || el.SetFromN == nil {
		t.Fatalf("elastic limit %+v, want bracket %.0f..%.0f N", el, e.NoSetUpToN, e.SetFromN)
	}
	if math.Abs(*el.NoSetUpToN-e.NoSetUpToN) > e.ForceTolN || math.Abs(*el.SetFromN-e.SetFromN) > e.ForceTolN {
		t.Errorf("elastic limit %.2f..%.2f N, want %.0f..%.0f", *el.NoSetUpToN, *el.SetFromN, e.NoSetUpToN, e.SetFromN)
	}
	var breaks []Emission
	for _, em := range ems {
		if em.Event.Kind == reduce.EventBreak {
			breaks = append(breaks, em)
		}
	}
	if len(breaks) != 1 {
		t.Fatalf("breaks %+v, want one at %.3f s", breaks, e.BreakS)
	}
	if lat := breaks[0].ProvedAtS - e.BreakS; lat > e.BreakTolS+1e-9 || lat < 0 {
		t.Errorf("break proved %.4f s after the fracture sample, want within %.3f s", lat, e.BreakTolS)
	}
	if dt := math.Abs(breaks[0].Event.TimeS - e.BreakS); dt > e.BreakTolS+1e-9 {
		t.Errorf("break dated %.4f s, fracture at %.4f s", breaks[0].Event.TimeS, e.BreakS)
	}
}
