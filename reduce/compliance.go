package reduce

import "fmt"

// Machine compliance from a calibration test, for frames that read only
// the crosshead. The crosshead moves by the specimen's stretch plus the
// load train's, C x F. Two calibrations give C:
//
//   - a rigid specimen (a thick block, or the grips closed on each other):
//     the specimen's stretch is negligible, so C is the slope of crosshead
//     on force;
//   - a bar of known modulus E, cross-section S0 and free length L: the
//     slope is C + L / (E S0), so C is the slope less L / (E S0).
//
// The slope is the least-squares line of crosshead on force over the
// loading between 10 % and 60 % of the largest force (the seating at the
// start and any yielding at the top left out; common practice). The
// result goes to Options.ComplianceMMPerN.

// ComplianceRigid is the load train's compliance in mm/N from a test on a
// rigid specimen.
func ComplianceRigid(c Curve) (float64, error) {
	return complianceSlope(c)
}

// ComplianceKnownBar is the load train's compliance in mm/N from a test on
// a bar of known modulus eMPa, cross-section s0MM2 and free length lMM
// (between the grips).
func ComplianceKnownBar(c Curve, eMPa, s0MM2, lMM float64) (float64, error) {
	if !(eMPa > 0) || !(s0MM2 > 0) || !(lMM > 0) || !finite(eMPa*s0MM2*lMM) {
		return 0, fmt.Errorf("%w: bar E %v MPa, S0 %v mm2, L %v mm must be positive", ErrBadOptions, eMPa, s0MM2, lMM)
	}
	slope, err := complianceSlope(c)
	if err != nil {
		return 0, err
	}
	comp := slope - lMM/(eMPa*s0MM2)
	if !(comp >= 0) {
		return 0, fmt.Errorf("%w: the bar stretched less than E says (slope %.3g mm/N, bar alone %.3g): check E, S0 and L", ErrNoCalibration, slope, lMM/(eMPa*s0MM2))
	}
	return comp, nil
}

func complianceSlope(c Curve) (float64, error) {
	n := c.Len()
	if n == 0 || len(c.ForceN) != n || len(c.CrossheadMM) != n {
		return 0, fmt.Errorf("%w: need force and crosshead columns", ErrNoCalibration)
	}
	top, iTop := 0.0, -1
	for i, f := range c.ForceN {
		if finite(f) && f > top {
			top, iTop = f, i
		}
	}
	if iTop < 0 {
		return 0, fmt.Errorf("%w: no positive force", ErrNoCalibration)
	}
	var s sums
	var x0 float64
	started := false
	for i := 0; i <= iTop; i++ {
		f, x := c.ForceN[i], c.CrossheadMM[i]
		if !finite(f) || !finite(x) || f < 0.1*top || f > 0.6*top {
			continue
		}
		if !started {
			x0, started = x, true
		}
		s.add(f, x-x0)
	}
	l, ok := s.fit()
	if !ok || l.points < minFitPoints || !(l.slope > 0) {
		return 0, fmt.Errorf("%w: %d loading points between 10 %% and 60 %% of the top force", ErrNoCalibration, int(s.n))
	}
	return l.slope, nil
}
