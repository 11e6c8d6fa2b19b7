package detectgen

import (
	"math"
	"testing"
)

// TestWireFollowsHooke: below the elastic limit the wire's extension is
// F·L/(E·S) (Hooke's law; E of steel about 200 GPa, handbook value), with
// the 1 mm wire 1 m long: 100 N stretch it by 100/157 mm. Past the limit
// the unloaded wire keeps a set, and it creeps under the last weights.
func TestWireFollowsHooke(t *testing.T) {
	g := Wire(200, 1)
	c, tr := g.Generate()
	const eGPa, areaMM2, lengthMM = 200, math.Pi / 4, 1000
	kNPerMM := eGPa * 1e3 * areaMM2 / lengthMM
	if math.Abs(kNPerMM-g.StiffnessNPerMM) > 0.5 {
		t.Fatalf("scenario stiffness %.1f N/mm, Hooke gives %.1f", g.StiffnessNPerMM, kNPerMM)
	}
	for _, h := range tr.Holds {
		if h.Creeping {
			continue
		}
		if want := h.ForceN / kNPerMM; math.Abs(h.ExtensionMM-want) > 0.005 {
			t.Errorf("hold %.0f N: extension %.4f mm, Hooke gives %.4f", h.ForceN, h.ExtensionMM, want)
		}
	}
	if len(tr.Unloads) != 3 || math.Abs(tr.Unloads[0].SetMM) > 1e-3 || tr.Unloads[2].SetMM < 0.1 {
		t.Errorf("unloads %+v: want no set after the elastic cycles, set after the one past the limit", tr.Unloads)
	}
	if tr.NoSetUpToN != 400 || tr.SetFromN != 500 {
		t.Errorf("bracket %.0f..%.0f N, want 400..500 N", tr.NoSetUpToN, tr.SetFromN)
	}
	// Creep: the extension grows through the hold under 600 N.
	var h HoldTruth
	for _, x := range tr.Holds {
		if x.ForceN == 600 {
			h = x
		}
	}
	i0, i1 := int(h.SettleS*g.RateHz), int((h.EndS-0.5)*g.RateHz)
	if c.ExtensionMM[i1]-c.ExtensionMM[i0] < 0.02 {
		t.Errorf("no creep under 600 N: %.4f -> %.4f mm", c.ExtensionMM[i0], c.ExtensionMM[i1])
	}
	if tr.FractureIndex < 0 || c.ForceN[tr.FractureIndex] > 1 || !math.IsNaN(c.ExtensionMM[tr.FractureIndex]) {
		t.Errorf("no fracture at index %d", tr.FractureIndex)
	}
}

// TestSwingDecays: after a change the force swings about its new level
// with the damped natural frequency, and the swing dies out.
func TestSwingDecays(t *testing.T) {
	g := Wire(1000, 2)
	g.Sensor = Sensor{ForceNoiseN: 0.001}
	c, tr := g.Generate()
	h := tr.Holds[0]
	i := int((h.ChangeEndS + 0.01) * g.RateHz)
	if d := math.Abs(c.ForceN[i] - h.ForceN); d < 0.3*h.ForceN*g.SwingFraction {
		t.Errorf("no swing just after the weights go on: off by %.2f N", d)
	}
	j := int(h.SettleS * g.RateHz)
	if d := math.Abs(c.ForceN[j] - h.ForceN); d > 0.006 { // swing down to the 0.001 N noise
		t.Errorf("still swinging by %.4f N at the settle time", d)
	}
}

func TestContinuousBreaks(t *testing.T) {
	g := Continuous{RateHz: 100, IdleS: 1, StiffnessNPerMM: 20000, YieldN: 5000, MaxN: 7000,
		UpperYieldFraction: 0.05, FractureFraction: 0.8, Break: true, AfterBreakS: 0.5, DurationS: 20}
	c, tr := g.Generate()
	if math.Abs(tr.PeakN-7000) > 1 {
		t.Errorf("peak %.1f N, want Fm 7000 N", tr.PeakN)
	}
	if f := c.ForceN[tr.FractureIndex-1]; math.Abs(f-0.8*7000) > 100 {
		t.Errorf("force before fracture %.0f N, want about 80 %% of Fm", f)
	}
	if c.ForceN[tr.FractureIndex] != 0 || math.Abs(tr.FractureS-21) > 0.02 {
		t.Errorf("fracture at %.3f s (force %.1f), want 21 s", tr.FractureS, c.ForceN[tr.FractureIndex])
	}
}
