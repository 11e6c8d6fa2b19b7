package sim

import (
	"fmt"
	"math"

	"framed/reduce"
)

// Mode is how a simulated specimen is loaded.
type Mode string

const (
	// ModeRate drives the crosshead at a constant rate through a load
	// train of finite stiffness until the specimen breaks.
	ModeRate Mode = "rate"
	// ModeDeadWeight hangs weights on the specimen in steps; each change
	// sets the hanger swinging, and the swing rings down.
	ModeDeadWeight Mode = "dead-weight"
)

// StandardGravity is g in m/s2 (3rd CGPM, 1901).
const StandardGravity = 9.80665

// Specimen is one simulated test: identity, geometry (the fields and JSON
// names of reduce.Specimen), the material model and how it is loaded.
type Specimen struct {
	ID    string       `json:"id"`
	Shape reduce.Shape `json:"shape"`

	D0MM           float64 `json:"d0_mm,omitempty"`
	A0MM           float64 `json:"a0_mm,omitempty"`
	B0MM           float64 `json:"b0_mm,omitempty"`
	OuterD0MM      float64 `json:"D0_mm,omitempty"`
	MassG          float64 `json:"mass_g,omitempty"`
	TotalLengthMM  float64 `json:"Lt_mm,omitempty"`
	DensityGPerCM3 float64 `json:"density_g_per_cm3,omitempty"`
	S0MM2          float64 `json:"S0_mm2,omitempty"`
	L0MM           float64 `json:"L0_mm"`
	// LeMM is the extensometer gauge length, default L0MM.
	LeMM float64 `json:"Le_mm,omitempty"`
	// LcMM is the free length between the grips that stretches with the
	// specimen's strain (crosshead travel), default L0MM.
	LcMM float64 `json:"Lc_mm,omitempty"`

	Material Material `json:"material"`
	Loading  Loading  `json:"loading"`
}

// Loading says how the specimen is loaded and what the load train is like.
type Loading struct {
	Mode Mode `json:"mode"`
	// CrossheadMMPerMin is the constant crosshead rate (rate mode).
	CrossheadMMPerMin float64 `json:"crosshead_mm_per_min,omitempty"`
	// RateChangePct, if set, is the engineering strain (%) past which the
	// crosshead runs at CrossheadAfterMMPerMin: slow through the elastic
	// range and yielding, faster after, as ISO 6892-1 allows.
	RateChangePct          float64 `json:"rate_change_pct,omitempty"`
	CrossheadAfterMMPerMin float64 `json:"crosshead_after_mm_per_min,omitempty"`
	// StiffnessNPerMM is the load train's stiffness (frame, grips, load
	// cell, hanger): the machine compliance is its inverse.
	StiffnessNPerMM float64 `json:"stiffness_N_per_mm"`
	// ExtensometerOffPct removes the extensometer at this engineering
	// strain (%); 0 keeps it on to fracture.
	ExtensometerOffPct float64 `json:"extensometer_off_pct,omitempty"`

	// Steps are the dead weights in order (dead-weight mode).
	Steps []WeightStep `json:"steps,omitempty"`
	// SwingHz and SwingZeta are the hanger's natural frequency and
	// damping ratio; SwingFraction is how much of each change is let go
	// at once (1: dropped on, 0: lowered gently).
	SwingHz       float64 `json:"swing_hz,omitempty"`
	SwingZeta     float64 `json:"swing_zeta,omitempty"`
	SwingFraction float64 `json:"swing_fraction,omitempty"`
}

// WeightStep is the total hanging mass (hanger included) after a change
// of weights, held for HoldS seconds of test time.
type WeightStep struct {
	MassKG float64 `json:"mass_kg"`
	HoldS  float64 `json:"hold_s"`
}

// Geometry is the specimen as the reduction needs it.
func (s Specimen) Geometry() reduce.Specimen {
	return reduce.Specimen{
		ID:             s.ID,
		Material:       s.Material.Name,
		Shape:          s.Shape,
		D0MM:           s.D0MM,
		A0MM:           s.A0MM,
		B0MM:           s.B0MM,
		OuterD0MM:      s.OuterD0MM,
		MassG:          s.MassG,
		TotalLengthMM:  s.TotalLengthMM,
		DensityGPerCM3: s.DensityGPerCM3,
		S0MM2:          s.S0MM2,
		L0MM:           s.L0MM,
		LeMM:           s.LeMM,
	}
}

// CrossSectionMM2 is S0 from the geometry (ISO 6892-1 formulas): S0MM2
// when set, else round pi d0^2/4, rect a0 b0, tube pi a0 (D0 - a0), wire
// m / (rho Lt). It returns NaN when the geometry is incomplete.
func (s Specimen) CrossSectionMM2() float64 {
	switch {
	case s.S0MM2 > 0:
		return s.S0MM2
	case s.Shape == reduce.ShapeRound && s.D0MM > 0:
		return math.Pi * s.D0MM * s.D0MM / 4
	case s.Shape == reduce.ShapeRect && s.A0MM > 0 && s.B0MM > 0:
		return s.A0MM * s.B0MM
	case s.Shape == reduce.ShapeTube && s.A0MM > 0 && s.OuterD0MM > 2*s.A0MM:
		return math.Pi * s.A0MM * (s.OuterD0MM - s.A0MM)
	case s.Shape == reduce.ShapeWire && s.MassG > 0 && s.TotalLengthMM > 0 && s.DensityGPerCM3 > 0:
		// g / (g/cm3 * mm) = 1000 mm3 / mm.
		return 1000 * s.MassG / (s.DensityGPerCM3 * s.TotalLengthMM)
	}
	return math.NaN()
}

// FmN is the maximum force the model will reach, Rm times S0.
func (s Specimen) FmN() float64 { return s.Material.Truth().RmMPa * s.CrossSectionMM2() }

func (s Specimen) leMM() float64 {
	if s.LeMM > 0 {
		return s.LeMM
	}
	return s.L0MM
}

func (s Specimen) lcMM() float64 {
	if s.LcMM > 0 {
		return s.LcMM
	}
	return s.L0MM
}

// Validate checks geometry, material and loading. Errors name the
// specimen and the field.
func (s Specimen) Validate() error {
	wrap := func(err error) error { return fmt.Errorf("specimen %q: %w", s.ID, err) }
	if s.ID == "" {
		return fmt.Errorf("specimen without id")
	}
	if s0 := s.CrossSectionMM2(); !(s0 > 0) || math.IsInf(s0, 0) {
		return wrap(fmt.Errorf("no cross-section: shape %q needs its dimensions (or S0_mm2)", string(s.Shape)))
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"L0_mm", s.L0MM}, {"Le_mm", s.leMM()}, {"Lc_mm", s.lcMM()}} {
		if !(f.v > 0) || math.IsInf(f.v, 0) {
			return wrap(fmt.Errorf("%s = %v, want a positive length", f.name, f.v))
		}
	}
	if err := s.Material.Validate(); err != nil {
		return wrap(err)
	}
	l := s.Loading
	if !(l.StiffnessNPerMM > 0) || math.IsInf(l.StiffnessNPerMM, 0) {
		return wrap(fmt.Errorf("stiffness_N_per_mm = %v, want a positive stiffness", l.StiffnessNPerMM))
	}
	if !(l.ExtensometerOffPct >= 0) {
		return wrap(fmt.Errorf("extensometer_off_pct = %v, want >= 0", l.ExtensometerOffPct))
	}
	switch l.Mode {
	case ModeRate:
		if !(l.CrossheadMMPerMin > 0 && l.CrossheadMMPerMin <= 1000) {
			return wrap(fmt.Errorf("crosshead_mm_per_min = %v, want 0 < rate <= 1000", l.CrossheadMMPerMin))
		}
		if l.RateChangePct != 0 || l.CrossheadAfterMMPerMin != 0 {
			if !(l.RateChangePct > 0 && l.RateChangePct < s.Material.FracturePct) {
				return wrap(fmt.Errorf("rate_change_pct = %v, want 0 < strain < fracture_pct", l.RateChangePct))
			}
			if !(l.CrossheadAfterMMPerMin > 0 && l.CrossheadAfterMMPerMin <= 1000) {
				return wrap(fmt.Errorf("crosshead_after_mm_per_min = %v, want 0 < rate <= 1000", l.CrossheadAfterMMPerMin))
			}
		}
	case ModeDeadWeight:
		if len(l.Steps) == 0 {
			return wrap(fmt.Errorf("dead-weight loading needs steps"))
		}
		for i, st := range l.Steps {
			if !(st.MassKG >= 0 && st.MassKG < 1e5) || !(st.HoldS > 0 && st.HoldS < 1e5) {
				return wrap(fmt.Errorf("step %d: mass_kg %v, hold_s %v: want 0 <= mass < 1e5 kg and 0 < hold < 1e5 s", i+1, st.MassKG, st.HoldS))
			}
		}
		if !(l.SwingHz > 0 && l.SwingHz <= 100) {
			return wrap(fmt.Errorf("swing_hz = %v, want 0 < f <= 100", l.SwingHz))
		}
		if !(l.SwingZeta > 0 && l.SwingZeta < 1) {
			return wrap(fmt.Errorf("swing_zeta = %v, want an underdamped 0 < zeta < 1", l.SwingZeta))
		}
		if !(l.SwingFraction >= 0 && l.SwingFraction <= 1) {
			return wrap(fmt.Errorf("swing_fraction = %v, want 0..1", l.SwingFraction))
		}
	default:
		return wrap(fmt.Errorf("loading mode %q, want %q or %q", string(l.Mode), ModeRate, ModeDeadWeight))
	}
	return nil
}
