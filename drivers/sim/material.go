package sim

import (
	"fmt"
	"math"
)

// Law names the hardening model of a simulated material.
type Law string

const (
	// LawRO is Ramberg-Osgood in proof-strength form on engineering
	// stress and strain: e = s/E + 0.002 (s/Rp0.2)^m (NACA TN 902), so
	// Rp0.2 is exact by construction. Necking starts at NeckPct.
	LawRO Law = "ro"
	// LawHollomon is true stress sigma = K eps_p^n plus the elastic
	// strain, turned into engineering values by constant volume
	// (s = sigma/(1+e), e = exp(eps)-1). The engineering maximum then
	// comes by itself where Considere puts it; necking starts there.
	LawHollomon Law = "hollomon"
	// LawYieldPoint is a material with a marked yield point: elastic to
	// ReH, a drop to a ReL plateau over the Lueders extension Ae, then
	// Swift hardening s = ReL (1 + (e - eL)/e0)^n. Necking starts at
	// NeckPct.
	LawYieldPoint Law = "yield-point"
)

// Material is the mechanical model of a specimen's metal. Stresses in MPa,
// strains and elongations in percent where the name says Pct.
type Material struct {
	Name string `json:"name"`
	// Law is "ro" (default), "hollomon" or "yield-point".
	Law  Law     `json:"law,omitempty"`
	EMPa float64 `json:"E_MPa"`

	// Ramberg-Osgood: proof strength and exponent m.
	Rp02MPa float64 `json:"Rp02_MPa,omitempty"`
	M       float64 `json:"m,omitempty"`

	// Hollomon: strength coefficient K and hardening exponent n. The
	// yield-point law takes n as its Swift exponent.
	KMPa float64 `json:"K_MPa,omitempty"`
	N    float64 `json:"n,omitempty"`

	// Yield point: upper and lower yield strength, Lueders extension, and
	// the Swift offset strain e0 of the hardening that follows.
	ReHMPa  float64 `json:"ReH_MPa,omitempty"`
	ReLMPa  float64 `json:"ReL_MPa,omitempty"`
	AePct   float64 `json:"Ae_pct,omitempty"`
	SwiftE0 float64 `json:"swift_e0,omitempty"`

	// NeckPct is the total engineering strain at which necking begins
	// (ro and yield-point; hollomon necks at its own maximum).
	NeckPct float64 `json:"neck_pct,omitempty"`
	// FracturePct is the total engineering strain at fracture.
	FracturePct float64 `json:"fracture_pct"`
	// NeckDrop is the fraction of the uniform-flow stress lost between
	// the onset of necking and fracture (0.1 to 0.5 is typical of ductile
	// metals, common practice).
	NeckDrop float64 `json:"neck_drop,omitempty"`

	// Creep under a constant load in plastic flow, logarithmic
	// (primary) creep e_c = CreepPct/100 * ln(1 + t/CreepTauS).
	CreepPct  float64 `json:"creep_pct,omitempty"`
	CreepTauS float64 `json:"creep_tau_s,omitempty"`
}

// luedersDropStrain is the strain over which the stress falls from ReH to
// ReL; it is short against Ae, so the drop shows as a marked force drop.
const luedersDropStrain = 0.0004

// law returns the effective law (the default is ro).
func (m Material) law() Law {
	if m.Law == "" {
		return LawRO
	}
	return m.Law
}

// Validate checks the parameters. Errors name the field.
func (m Material) Validate() error {
	bad := func(field string, v float64, want string) error {
		return fmt.Errorf("material %q: %s = %v, want %s", m.Name, field, v, want)
	}
	finitePos := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	if !finitePos(m.EMPa) {
		return bad("E_MPa", m.EMPa, "a positive modulus")
	}
	if !finitePos(m.FracturePct) || m.FracturePct > 200 {
		return bad("fracture_pct", m.FracturePct, "0 < fracture_pct <= 200")
	}
	if !(m.NeckDrop >= 0 && m.NeckDrop < 1) {
		return bad("neck_drop", m.NeckDrop, "0 <= neck_drop < 1")
	}
	if !(m.CreepPct >= 0 && m.CreepPct < 10) {
		return bad("creep_pct", m.CreepPct, "0 <= creep_pct < 10")
	}
	if m.CreepPct > 0 && !finitePos(m.CreepTauS) {
		return bad("creep_tau_s", m.CreepTauS, "a positive time when creep_pct is set")
	}
	needNeck := func() error {
		if !finitePos(m.NeckPct) || m.NeckPct >= m.FracturePct {
			return bad("neck_pct", m.NeckPct, fmt.Sprintf("0 < neck_pct < fracture_pct (%v)", m.FracturePct))
		}
		return nil
	}
	switch m.law() {
	case LawRO:
		if !finitePos(m.Rp02MPa) || m.Rp02MPa >= m.EMPa*0.05 {
			return bad("Rp02_MPa", m.Rp02MPa, "a positive proof strength well below E")
		}
		if !(m.M >= 2 && m.M <= 200) {
			return bad("m", m.M, "2 <= m <= 200")
		}
		if m.NeckPct/100 <= m.Rp02MPa/m.EMPa+0.002 {
			return bad("neck_pct", m.NeckPct, "beyond the Rp0.2 point")
		}
		return needNeck()
	case LawHollomon:
		if !finitePos(m.KMPa) || m.KMPa >= m.EMPa*0.1 {
			return bad("K_MPa", m.KMPa, "a positive strength coefficient well below E")
		}
		if !(m.N >= 0.02 && m.N <= 0.8) {
			return bad("n", m.N, "0.02 <= n <= 0.8")
		}
		if math.Exp(m.N)-1 >= m.FracturePct/100 {
			return bad("fracture_pct", m.FracturePct, "beyond the Considere maximum at true strain n")
		}
		return nil
	case LawYieldPoint:
		if !finitePos(m.ReHMPa) || m.ReHMPa >= m.EMPa*0.05 {
			return bad("ReH_MPa", m.ReHMPa, "a positive strength well below E")
		}
		if !finitePos(m.ReLMPa) || m.ReLMPa > m.ReHMPa {
			return bad("ReL_MPa", m.ReLMPa, "0 < ReL <= ReH")
		}
		if !(m.AePct > 0 && m.AePct < 20) {
			return bad("Ae_pct", m.AePct, "0 < Ae < 20")
		}
		if !(m.N >= 0.02 && m.N <= 0.8) {
			return bad("n", m.N, "0.02 <= n <= 0.8")
		}
		if !(m.SwiftE0 > 0 && m.SwiftE0 < 1) {
			return bad("swift_e0", m.SwiftE0, "0 < e0 < 1")
		}
		if m.NeckPct/100 <= m.luedersEnd() {
			return bad("neck_pct", m.NeckPct, "beyond the end of the Lueders plateau")
		}
		return needNeck()
	default:
		return fmt.Errorf("material %q: unknown law %q (want ro, hollomon or yield-point)", m.Name, string(m.Law))
	}
}

// luedersEnd is the engineering strain where the ReL plateau ends.
func (m Material) luedersEnd() float64 {
	return m.ReHMPa/m.EMPa + m.AePct/100
}

// uniformStress is the engineering stress in MPa at engineering strain e
// before any necking.
func (m Material) uniformStress(e float64) float64 {
	if e <= 0 {
		return m.EMPa * e
	}
	switch m.law() {
	case LawHollomon:
		eps := math.Log1p(e)
		sigma := solvePowerLaw(eps, m.EMPa, 1, m.KMPa, 1/m.N)
		return sigma / (1 + e)
	case LawYieldPoint:
		eH := m.ReHMPa / m.EMPa
		switch {
		case e <= eH:
			return m.EMPa * e
		case e <= eH+luedersDropStrain:
			x := (e - eH) / luedersDropStrain
			smooth := x * x * (3 - 2*x)
			return m.ReHMPa - (m.ReHMPa-m.ReLMPa)*smooth
		case e <= m.luedersEnd():
			return m.ReLMPa
		default:
			return m.ReLMPa * math.Pow(1+(e-m.luedersEnd())/m.SwiftE0, m.N)
		}
	default:
		return solvePowerLaw(e, m.EMPa, 0.002, m.Rp02MPa, m.M)
	}
}

// solvePowerLaw returns s with target = s/E + c (s/ref)^p (p > 1), the
// Ramberg-Osgood and Hollomon strain sums. The right side is increasing
// and convex in s, so Newton from an upper bound converges monotonically.
func solvePowerLaw(target, eMPa, c, ref, p float64) float64 {
	if target <= 0 {
		return eMPa * target
	}
	s := math.Min(eMPa*target, ref*math.Pow(target/c, 1/p))
	for range 100 {
		f := s/eMPa + c*math.Pow(s/ref, p) - target
		df := 1/eMPa + c*p*math.Pow(s/ref, p)/s
		step := f / df
		s -= step
		if math.Abs(step) <= 1e-13*s {
			break
		}
	}
	return s
}

// model is a Material with its derived constants worked out once, so the
// per-sample hot path does no searching.
type model struct {
	Material
	neckE     float64 // engineering strain where necking begins
	fractureE float64 // engineering strain at fracture
}

func (m Material) compile() model {
	c := model{Material: m, fractureE: m.FracturePct / 100}
	if m.law() == LawHollomon {
		// Necking begins at the engineering maximum of uniform flow,
		// found numerically; Considere puts it at true strain n.
		c.neckE = maximise(m.uniformStress, 1e-6, c.fractureE)
	} else {
		c.neckE = m.NeckPct / 100
	}
	return c
}

// stress is the engineering stress in MPa at total engineering strain e
// on the monotonic loading curve, necking included; 0 past fracture.
func (c model) stress(e float64) float64 {
	if e > c.fractureE {
		return 0
	}
	s := c.uniformStress(e)
	if e > c.neckE {
		x := (e - c.neckE) / (c.fractureE - c.neckE)
		s *= 1 - c.NeckDrop*x*x
	}
	return s
}

// Stress is the engineering stress in MPa at total engineering strain e on
// the monotonic loading curve, necking included; 0 past fracture. It is
// the exact model; the simulator samples a fine table of it.
func (m Material) Stress(e float64) float64 { return m.compile().stress(e) }

// maximise finds the maximum of a unimodal-near-the-top f on [lo, hi]: a
// coarse scan brackets it, then golden-section search refines it.
func maximise(f func(float64) float64, lo, hi float64) float64 {
	const scan = 4000
	best, bestV := lo, math.Inf(-1)
	h := (hi - lo) / scan
	for i := 0; i <= scan; i++ {
		x := lo + float64(i)*h
		if v := f(x); v > bestV {
			best, bestV = x, v
		}
	}
	a, b := math.Max(lo, best-h), math.Min(hi, best+h)
	g := (math.Sqrt(5) - 1) / 2
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := f(c), f(d)
	for range 200 {
		if b-a < 1e-13 {
			break
		}
		if fc > fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = f(d)
		}
	}
	return (a + b) / 2
}
