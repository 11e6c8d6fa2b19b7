package verify

import (
	"fmt"
	"io"
	"math"
)

// Displacement is one extensometer verification reading: the calibrator
// set ReferenceMM, the extensometer indicated IndicatedMM.
type Displacement struct {
	ReferenceMM float64 `json:"reference_mm"`
	IndicatedMM float64 `json:"indicated_mm"`
}

// ExtensometerReport is the ISO 9513 classification of an extensometer.
type ExtensometerReport struct {
	Points []ExtensometerPoint `json:"points"`
	// Class is the worst of the points' classes: the class the extensometer
	// meets over the verified range.
	Class        Class   `json:"class"`
	ResolutionMM float64 `json:"resolution_mm"`
}

// ExtensometerPoint is one reading's errors and the best class it meets.
type ExtensometerPoint struct {
	ReferenceMM float64 `json:"reference_mm"`
	IndicatedMM float64 `json:"indicated_mm"`
	// BiasUM is indicated minus reference, in micrometres.
	BiasUM float64 `json:"bias_um"`
	// BiasPct is the bias in percent of the reference; nil at a zero
	// reference, where only the absolute limit applies.
	BiasPct *float64 `json:"bias_pct"`
	Class   Class    `json:"class"`
	Reasons []string `json:"reasons"`
}

// ClassifyExtensometer classes an extensometer per ISO 9513 from readings
// against a calibrator. Each limit is the larger of a percentage of the
// reference and an absolute value (ExtensometerLimits, FROM MEMORY).
// resolutionMM is the extensometer's resolution, positive.
func ClassifyExtensometer(readings []Displacement, resolutionMM float64) (ExtensometerReport, error) {
	if len(readings) == 0 {
		return ExtensometerReport{}, ErrNoReadings
	}
	if math.IsNaN(resolutionMM) || math.IsInf(resolutionMM, 0) || resolutionMM <= 0 {
		return ExtensometerReport{}, fmt.Errorf("%w: %v mm must be positive and finite", ErrBadResolution, resolutionMM)
	}
	rep := ExtensometerReport{ResolutionMM: resolutionMM, Class: Class02}
	for i, d := range readings {
		if !finite(d.ReferenceMM) || !finite(d.IndicatedMM) {
			return ExtensometerReport{}, fmt.Errorf("reading %d: %w: %v mm, %v mm", i+1, ErrBadNumber, d.ReferenceMM, d.IndicatedMM)
		}
		p := classifyDisplacement(d, resolutionMM)
		if !finite(p.BiasUM) || (p.BiasPct != nil && !finite(*p.BiasPct)) {
			return ExtensometerReport{}, fmt.Errorf("reading %d: %w: bias of %v mm against %v mm is out of range", i+1, ErrBadNumber, d.IndicatedMM, d.ReferenceMM)
		}
		rep.Class = rep.Class.Worse(p.Class)
		rep.Points = append(rep.Points, p)
	}
	return rep, nil
}

func classifyDisplacement(d Displacement, resolutionMM float64) ExtensometerPoint {
	biasMM := d.IndicatedMM - d.ReferenceMM
	p := ExtensometerPoint{ReferenceMM: d.ReferenceMM, IndicatedMM: d.IndicatedMM, BiasUM: 1000 * biasMM, Reasons: []string{}}
	if d.ReferenceMM != 0 {
		b := 100 * biasMM / d.ReferenceMM
		p.BiasPct = &b
	}
	// FROM MEMORY: the class limits come from ExtensometerLimits.
	for i, l := range ExtensometerLimits {
		if fails := displacementExceeds(d, biasMM, resolutionMM, l); len(fails) == 0 {
			p.Class = l.Class
			if i > 0 {
				p.Reasons = displacementExceeds(d, biasMM, resolutionMM, ExtensometerLimits[i-1])
			}
			return p
		}
	}
	p.Reasons = displacementExceeds(d, biasMM, resolutionMM, ExtensometerLimits[len(ExtensometerLimits)-1])
	return p
}

// displacementExceeds lists which of class l's limits the reading breaks.
// Each limit is the larger of l's percentage of the reference and its
// absolute value.
func displacementExceeds(d Displacement, biasMM, resolutionMM float64, l ExtensometerLimit) []string {
	var out []string
	ref := math.Abs(d.ReferenceMM)
	biasLimMM := max(l.BiasPct/100*ref, l.BiasUM/1000)
	if !within(biasMM, biasLimMM) {
		out = append(out, fmt.Sprintf("bias %+.3f um exceeds class %s limit ±%.3f um (larger of %g %% and %g um)",
			1000*biasMM, l.Class, 1000*biasLimMM, l.BiasPct, l.BiasUM))
	}
	resLimMM := max(l.ResolutionPct/100*ref, l.ResolutionUM/1000)
	if !within(resolutionMM, resLimMM) {
		out = append(out, fmt.Sprintf("resolution %.3f um exceeds class %s limit %.3f um (larger of %g %% and %g um)",
			1000*resolutionMM, l.Class, 1000*resLimMM, l.ResolutionPct, l.ResolutionUM))
	}
	return out
}

// ReadDisplacements parses an extensometer readings file: a CSV with the
// header reference_mm,indicated_mm, then one reading per line. Errors name
// the line and wrap ErrBadHeader, ErrBadLine or ErrBadNumber.
func ReadDisplacements(r io.Reader) ([]Displacement, error) {
	var out []Displacement
	err := readCSV(r, DisplacementHeader, func(line int, f []string) error {
		ref, err := parseNumber(f[0], "reference_mm")
		if err != nil {
			return fmt.Errorf("line %d: %w", line, err)
		}
		ind, err := parseNumber(f[1], "indicated_mm")
		if err != nil {
			return fmt.Errorf("line %d: %w", line, err)
		}
		out = append(out, Displacement{ReferenceMM: ref, IndicatedMM: ind})
		return nil
	})
	if err != nil {
		return nil, err
	}
	if len(out) == 0 {
		return nil, ErrNoReadings
	}
	return out, nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
