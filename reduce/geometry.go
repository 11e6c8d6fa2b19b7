package reduce

import (
	"fmt"
	"math"
)

// CrossSectionMM2 is the original cross-section S0 (ISO 6892-1): S0MM2 when
// given, else from the shape: round pi d0^2/4, rect a0 b0, tube
// pi a0 (D0 - a0), wire m / (rho Lt).
func (s Specimen) CrossSectionMM2() (float64, error) {
	if s.S0MM2 != 0 {
		if !(s.S0MM2 > 0) || math.IsInf(s.S0MM2, 0) {
			return 0, fmt.Errorf("%w: S0 %v mm2 is not positive", ErrNoSection, s.S0MM2)
		}
		return s.S0MM2, nil
	}
	pos := func(name string, v float64) error {
		if !(v > 0) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: %s shape needs %s > 0 (got %v)", ErrNoSection, s.Shape, name, v)
		}
		return nil
	}
	switch s.Shape {
	case ShapeRound:
		if err := pos("d0", s.D0MM); err != nil {
			return 0, err
		}
		return math.Pi * s.D0MM * s.D0MM / 4, nil
	case ShapeRect:
		if err := pos("a0", s.A0MM); err != nil {
			return 0, err
		}
		if err := pos("b0", s.B0MM); err != nil {
			return 0, err
		}
		return s.A0MM * s.B0MM, nil
	case ShapeTube:
		if err := pos("a0", s.A0MM); err != nil {
			return 0, err
		}
		if err := pos("D0", s.OuterD0MM); err != nil {
			return 0, err
		}
		if 2*s.A0MM >= s.OuterD0MM {
			return 0, fmt.Errorf("%w: tube wall a0 %v mm too thick for D0 %v mm", ErrNoSection, s.A0MM, s.OuterD0MM)
		}
		return math.Pi * s.A0MM * (s.OuterD0MM - s.A0MM), nil
	case ShapeWire:
		if err := pos("mass", s.MassG); err != nil {
			return 0, err
		}
		if err := pos("Lt", s.TotalLengthMM); err != nil {
			return 0, err
		}
		if err := pos("density", s.DensityGPerCM3); err != nil {
			return 0, err
		}
		// m [g] / (rho [g/cm3] = 1e-3 g/mm3 * Lt [mm]) in mm2.
		return s.MassG / (s.DensityGPerCM3 * 1e-3 * s.TotalLengthMM), nil
	case "":
		return 0, fmt.Errorf("%w: give S0 or a shape with its dimensions", ErrNoSection)
	default:
		return 0, fmt.Errorf("%w: unknown shape %q", ErrNoSection, string(s.Shape))
	}
}

// relUS0 is the relative standard uncertainty of S0 from a standard
// uncertainty uDimMM on each measured dimension (and on mass/length for a
// wire, taken relative). Direct S0 carries uDimMM as a relative 0.5 %
// when nothing else is known (common practice: S0 to within +-1 %).
func (s Specimen) relUS0(uDimMM float64) float64 {
	if s.S0MM2 != 0 {
		return 0.01 / math.Sqrt(3)
	}
	switch s.Shape {
	case ShapeRound:
		return 2 * uDimMM / s.D0MM
	case ShapeRect:
		return math.Hypot(uDimMM/s.A0MM, uDimMM/s.B0MM)
	case ShapeTube:
		// S = pi a (D - a): dS/da = pi (D - 2a), dS/dD = pi a.
		S := s.A0MM * (s.OuterD0MM - s.A0MM)
		return math.Hypot((s.OuterD0MM-2*s.A0MM)*uDimMM, s.A0MM*uDimMM) / S
	case ShapeWire:
		// Mass to 0.1 % and length to uDimMM; density as published (0.5 %).
		return math.Sqrt(1e-6 + math.Pow(uDimMM/s.TotalLengthMM, 2) + 0.25e-4)
	}
	return 0.01 / math.Sqrt(3)
}

// gaugeLengths returns Le (extensometer) and L0 (original), each defaulting
// to the other.
func (s Specimen) gaugeLengths() (leMM, l0MM float64) {
	leMM, l0MM = s.LeMM, s.L0MM
	if !(leMM > 0) {
		leMM = l0MM
	}
	if !(l0MM > 0) {
		l0MM = leMM
	}
	return leMM, l0MM
}

// finalSectionMM2 is Su from SuMM2, else from du (round) or au bu (flat),
// and the relative standard uncertainty of it for a dimension uncertainty
// uDimMM. An area given directly is taken to 1 % (rectangular bound,
// common practice for a measured neck).
func (s Specimen) finalSectionMM2(uDimMM float64) (su, relU float64) {
	switch {
	case s.SuMM2 > 0:
		return s.SuMM2, 0.01 / math.Sqrt(3)
	case s.DuMM > 0:
		return math.Pi * s.DuMM * s.DuMM / 4, 2 * uDimMM / s.DuMM
	case s.AuMM > 0 && s.BuMM > 0:
		return s.AuMM * s.BuMM, math.Hypot(uDimMM/s.AuMM, uDimMM/s.BuMM)
	}
	return 0, 0
}
