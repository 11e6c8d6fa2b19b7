package calib

import (
	"fmt"
	"math"
)

// StandardGravity is the conventional acceleration of gravity, m/s2
// (3rd CGPM, 1901). The local value differs by up to about 0.5 %: use it
// when known (common practice).
const StandardGravity = 9.80665

// WeightN is the force a mass of massKG exerts at gravity gMS2. Air buoyancy
// (about 0.015 % for steel weights in air, common practice) is not
// corrected: give conventional masses and, if it matters, a corrected g.
func WeightN(massKG, gMS2 float64) float64 { return massKG * gMS2 }

// NormalGravity is the normal gravity of the WGS 84 ellipsoid at geodetic
// latitude latDeg (Somigliana's formula), reduced to heightM above the
// ellipsoid with the free-air gradient of 3.086e-6 s^-2 per metre (common
// practice). It estimates local g to about 0.01 %, enough where no gravity
// survey value is at hand.
//
// FROM MEMORY: the WGS 84 constants below were not read at source here.
func NormalGravity(latDeg, heightM float64) float64 {
	const (
		ge = 9.7803253359     // normal gravity at the equator, m/s2 (from memory)
		k  = 0.00193185265241 // Somigliana constant (from memory)
		e2 = 0.00669437999013 // first eccentricity squared (from memory)
	)
	s := math.Sin(latDeg * math.Pi / 180)
	s2 := s * s
	return ge*(1+k*s2)/math.Sqrt(1-e2*s2) - 3.086e-6*heightM
}

// ReferencesFromMasses pairs reference masses (kg) with the raw readings
// they gave, converting each mass to a force at gMS2 (StandardGravity when
// gMS2 is 0).
func ReferencesFromMasses(massesKG, indicatedRaw []float64, gMS2 float64) ([]Reference, error) {
	if gMS2 == 0 {
		gMS2 = StandardGravity
	}
	// Earth's surface gravity lies between about 9.76 and 9.84 m/s2; allow
	// a wide margin but refuse values that are clearly a unit mistake.
	if !finite(gMS2) || gMS2 < 9.7 || gMS2 > 9.9 {
		return nil, fmt.Errorf("%w: gravity %v m/s2 is not a value found on Earth's surface", ErrBadValue, gMS2)
	}
	if len(massesKG) != len(indicatedRaw) {
		return nil, fmt.Errorf("%w: %d masses but %d readings", ErrBadValue, len(massesKG), len(indicatedRaw))
	}
	refs := make([]Reference, len(massesKG))
	for i, m := range massesKG {
		if !finite(m) || m < 0 {
			return nil, fmt.Errorf("%w: mass %d is %v kg", ErrBadValue, i+1, m)
		}
		refs[i] = Reference{Reference: WeightN(m, gMS2), Indicated: indicatedRaw[i], MassKG: m}
	}
	return refs, nil
}
