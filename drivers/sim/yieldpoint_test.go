package sim

import (
	"math"
	"testing"
)

// A yield-point steel pulled at a constant rate shows what ISO 6892-1
// defines: the highest force before the first marked drop is ReH S0, the
// plateau that follows is ReL S0, and it lasts for the yield point
// extension Ae, from the onset of yielding to the start of work
// hardening. The extensometer comes off where configured while force
// and crosshead go on.
func TestYieldPointAndExtensometerRemoval(t *testing.T) {
	var ms Specimen
	for _, sp := range DemoScript() {
		if sp.Material.law() == LawYieldPoint {
			ms = sp
		}
	}
	m := ms.Material
	s0, le := ms.CrossSectionMM2(), ms.leMM()
	out := runSpecimen(t, ms, 0.005)
	// ReH: the first maximum, where the force first falls by 2 %.
	peak, iPeak := 0.0, 0
	for i, s := range out {
		if s.forceN > peak {
			peak, iPeak = s.forceN, i
		}
		if s.forceN < 0.98*peak {
			break
		}
	}
	if want := m.ReHMPa * s0; math.Abs(peak-want) > 0.002*want {
		t.Errorf("ReH force %.0f N, want ReH S0 = %.0f", peak, want)
	}
	// The plateau: samples at ReL S0 (within 0.1 %) after the peak.
	var first, last float64 = math.NaN(), math.NaN()
	for _, s := range out[iPeak:] {
		if math.Abs(s.forceN-m.ReLMPa*s0) <= 0.001*m.ReLMPa*s0 {
			if math.IsNaN(first) {
				first = s.extMM
			}
			last = s.extMM
		}
	}
	onset := out[iPeak].extMM
	if ae := 100 * (last - onset) / le; math.Abs(ae-m.AePct) > 0.05 {
		t.Errorf("plateau from %.4f to %.4f mm, Ae %.3f %%, want %v %%", onset, last, ae, m.AePct)
	}
	if math.IsNaN(first) || first-onset > 0.001*le {
		t.Errorf("plateau starts %.4f mm after the peak, want right after the drop", first-onset)
	}
	// Extensometer off at 10 %; force and crosshead carry on.
	off := 0
	for _, s := range out {
		if math.IsNaN(s.extMM) {
			if s.forceN > 0 {
				off++
			}
			continue
		}
		if s.extMM > ms.Loading.ExtensometerOffPct/100*le+1e-9 {
			t.Fatalf("extension %.3f mm past the removal at %v %%", s.extMM, ms.Loading.ExtensometerOffPct)
		}
	}
	if off == 0 {
		t.Error("no loaded samples after the extensometer came off")
	}
}
