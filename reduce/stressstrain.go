package reduce

import "math"

// StressStrain is a recording as the reduction sees it: engineering stress
// and strain with the strain zeroed where the elastic line meets zero
// stress (toe and preload compensation), on the curve's own sample index,
// and the true stress-strain curve up to the maximum force, the range in
// which it is valid (ISO 10275, ASTM E646). NaN where a sample has no
// reading.
type StressStrain struct {
	StrainPct []float64
	StressMPa []float64
	// TrueStrainPct = 100 ln(1 + e) and TrueStressMPa = s (1 + e), for the
	// samples up to FmIndex.
	TrueStrainPct []float64
	TrueStressMPa []float64
	FmIndex       int
	BreakIndex    int
	// EMPa is the slope of the elastic line through the origin (0 when
	// no elastic fit was possible).
	EMPa float64
}

// ComputeStressStrain runs the same steps as Reduce up to the elastic fit
// and returns the curves, so a plot or an export shows exactly the strain
// axis the result's values were read from.
func ComputeStressStrain(c Curve, sp Specimen, det Detected, opt Options) (StressStrain, error) {
	opt, err := opt.withDefaults()
	if err != nil {
		return StressStrain{}, err
	}
	w, err := newWork(c, sp, opt)
	if err != nil {
		return StressStrain{}, err
	}
	w.findBreak(det)
	w.buildStrain()
	w.noiseMPa = w.stressNoiseMPa()
	w.fitElastic()
	ss := StressStrain{StressMPa: w.stress, StrainPct: w.strain, FmIndex: w.iFm, BreakIndex: w.iBreak}
	for i := range ss.StrainPct {
		ss.StrainPct[i] *= 100
	}
	if w.fitOK {
		ss.EMPa = w.fit.slope
	}
	ss.TrueStrainPct = make([]float64, w.iFm+1)
	ss.TrueStressMPa = make([]float64, w.iFm+1)
	for i := 0; i <= w.iFm; i++ {
		e := ss.StrainPct[i] / 100
		ss.TrueStrainPct[i] = 100 * math.Log1p(e)
		ss.TrueStressMPa[i] = ss.StressMPa[i] * (1 + e)
	}
	return ss, nil
}
