package reduce

import "math"

// Uncertainty budget (GUM, expanded with k=2). Channel bias bounds are read
// from the classes in Options and taken as rectangular (bound / sqrt 3),
// common practice when only a class is known:
//   - force: the ISO 7500-1 class as a relative bound;
//   - extensometer: the ISO 9513 class bound, the larger of class % of the
//     reading and 3 um x class (from memory);
//   - dimensions: Options.DimensionUMM per measured dimension, standard;
//   - the fit: standard error of the slope and, for E, half the spread of E
//     over the acceptable fit windows (rectangular).
// Crosshead strain (no extensometer) carries a 5 % relative bound: the
// load train's stretch left after a compliance correction is rarely known
// better (common practice).

const kCoverage = 2

var sqrt3 = math.Sqrt(3)

// relUForce is the relative standard uncertainty of a force reading.
// A calibration's own uncertainty replaces the class when given.
func (w *work) relUForce() float64 {
	if w.opt.ForceRelUPct > 0 {
		return w.opt.ForceRelUPct / 100
	}
	return w.opt.ForceClassPct / 100 / sqrt3
}

// relUStress is the relative standard uncertainty of a stress F/S0.
func (w *work) relUStress() float64 {
	return math.Hypot(w.relUForce(), w.sp.relUS0(w.opt.DimensionUMM))
}

// uStrain is the standard uncertainty of a strain reading x (a fraction).
func (w *work) uStrain(x float64) float64 {
	if w.source == fromCrosshead {
		return math.Max(0.05*math.Abs(x), 0.02/w.leMM) / sqrt3
	}
	c := w.opt.ExtensometerClassPct
	if w.opt.ExtensometerRelUPct > 0 {
		// A calibration's relative uncertainty, with the class's absolute
		// floor (resolution does not calibrate away).
		return math.Max(w.opt.ExtensometerRelUPct/100*math.Abs(x), 0.003*c/w.leMM/sqrt3)
	}
	bound := math.Max(c/100*math.Abs(x), 0.003*c/w.leMM)
	return bound / sqrt3
}

// stitchBoundFrac bounds the error of extension carried on by the crosshead
// after an extensometer removal, as a fraction of the carried-on part: the
// split between uniform stretch and neck is only modelled (checked on the
// S355 reference curves, where At so found lies within 8 % of the
// increment from the value implied by Lu).
const stitchBoundFrac = 0.10

// uStrainAt is uStrain for sample i, plus the stitching part past an
// extensometer removal.
func (w *work) uStrainAt(i int) float64 {
	x := w.strain[i]
	u := w.uStrain(x)
	if w.iRemoved >= 0 && i > w.iRemoved {
		carried := x - w.strain[w.iRemoved]
		u = math.Hypot(u, stitchBoundFrac*math.Abs(carried)/sqrt3)
	}
	return u
}

// relUStrainScale is the relative standard uncertainty of strain as a
// scale (what E sees): the class's relative bound.
func (w *work) relUStrainScale() float64 {
	if w.source == fromCrosshead {
		return 0.05 / sqrt3
	}
	if w.opt.ExtensometerRelUPct > 0 {
		return w.opt.ExtensometerRelUPct / 100
	}
	return w.opt.ExtensometerClassPct / 100 / sqrt3
}

// uE is the standard uncertainty of E in MPa.
func (w *work) uE() float64 {
	e := w.fit.slope
	rel := math.Sqrt(math.Pow(w.relUStress(), 2) + math.Pow(w.relUStrainScale(), 2) +
		math.Pow(w.fit.seSlope/e, 2) + math.Pow(w.eSpreadMPa/e/sqrt3, 2))
	return rel * e
}

func expanded(u float64) *float64 {
	if !finite(u) || u < 0 {
		return nil
	}
	v := kCoverage * u
	return &v
}
