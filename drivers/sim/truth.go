package sim

import "math"

// Truth is what a perfect reduction of a simulated test must find: the
// material model's own properties, worked out numerically from the model
// (not copied from its parameters), so tests can hold the reduction to
// them. Strengths in MPa, elongations in % of the gauge length.
type Truth struct {
	EMPa    float64 `json:"E_MPa"`
	Rp02MPa float64 `json:"Rp02_MPa"`
	// ReH, ReL and Ae are zero for a material without a yield point.
	ReHMPa float64 `json:"ReH_MPa,omitempty"`
	ReLMPa float64 `json:"ReL_MPa,omitempty"`
	AePct  float64 `json:"Ae_pct,omitempty"`
	// RmMPa is the largest engineering stress of the model.
	RmMPa float64 `json:"Rm_MPa"`
	// AgPct is the plastic and AgtPct the total extension at Rm.
	AgPct  float64 `json:"Ag_pct"`
	AgtPct float64 `json:"Agt_pct"`
	// APct is the elongation after fracture (total minus the elastic
	// recovery of the fracture stress), AtPct the total at fracture.
	APct        float64 `json:"A_pct"`
	AtPct       float64 `json:"At_pct"`
	FractureMPa float64 `json:"fracture_MPa"`
}

// Truth works out the model's properties. The material must be valid.
func (m Material) Truth() Truth {
	c := m.compile()
	t := Truth{EMPa: m.EMPa}
	t.Rp02MPa = c.offsetProof(0.002)
	if m.law() == LawYieldPoint {
		t.ReHMPa, t.ReLMPa, t.AePct = m.ReHMPa, m.ReLMPa, m.AePct
	}
	// The overall maximum; for a yield-point material search beyond the
	// plateau, since Rm is the maximum of the hardening branch unless ReH
	// is higher (then Rm = ReH, ISO 6892-1).
	lo := 1e-7
	if m.law() == LawYieldPoint {
		lo = m.luedersEnd()
	}
	eM := maximise(c.stress, lo, c.fractureE)
	t.RmMPa = c.stress(eM)
	if m.law() == LawYieldPoint && m.ReHMPa > t.RmMPa {
		eM, t.RmMPa = m.ReHMPa/m.EMPa, m.ReHMPa
	}
	t.AgtPct = 100 * eM
	t.AgPct = 100 * (eM - t.RmMPa/m.EMPa)
	t.FractureMPa = c.stress(c.fractureE)
	t.AtPct = m.FracturePct
	t.APct = 100 * (c.fractureE - t.FractureMPa/m.EMPa)
	return t
}

// offsetProof finds the stress where the curve crosses a line of slope E
// offset by the plastic strain off (the ASTM E8 offset method), by
// bisection on a bracket found by scanning.
func (c model) offsetProof(off float64) float64 {
	g := func(e float64) float64 { return c.stress(e) - c.EMPa*(e-off) }
	lo, hi := off, off
	step := off / 64
	for g(hi) > 0 {
		lo = hi
		hi += step
		step *= 1.2
		if hi > c.fractureE {
			return math.NaN()
		}
	}
	for range 200 {
		mid := (lo + hi) / 2
		if mid == lo || mid == hi {
			break
		}
		if g(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	e := (lo + hi) / 2
	return c.stress(e)
}
