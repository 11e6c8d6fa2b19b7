package reduce_test

import (
	"errors"
	"math"
	"testing"

	"framed/reduce"
)

// A steel bar (E 205 GPa, a common handbook value for carbon steel) of
// 100 mm2 and 200 mm free length in a load train of 2.5e-5 mm/N: the
// crosshead reads F (C + L / (E S0)); the calibration must give C back.
// A rigid block gives C directly.
func TestComplianceCalibration(t *testing.T) {
	const c0, e, s0, l = 2.5e-5, 205000.0, 100.0, 200.0
	var bar, rigid reduce.Curve
	for i := 0; i <= 500; i++ {
		f := 30000 * float64(i) / 500
		bar.TimeS = append(bar.TimeS, float64(i))
		bar.ForceN = append(bar.ForceN, f)
		bar.CrossheadMM = append(bar.CrossheadMM, f*(c0+l/(e*s0)))
		rigid.TimeS = append(rigid.TimeS, float64(i))
		rigid.ForceN = append(rigid.ForceN, f)
		rigid.CrossheadMM = append(rigid.CrossheadMM, 0.3+f*c0)
	}
	got, err := reduce.ComplianceKnownBar(bar, e, s0, l)
	if err != nil || math.Abs(got/c0-1) > 1e-9 {
		t.Errorf("known bar: %v (%v), want %v", got, err, c0)
	}
	got, err = reduce.ComplianceRigid(rigid)
	if err != nil || math.Abs(got/c0-1) > 1e-9 {
		t.Errorf("rigid: %v (%v), want %v", got, err, c0)
	}
	if _, err := reduce.ComplianceKnownBar(bar, 2*e*10, s0, l*100); !errors.Is(err, reduce.ErrNoCalibration) {
		t.Errorf("impossible bar: %v", err)
	}
	if _, err := reduce.ComplianceRigid(reduce.Curve{TimeS: []float64{0}, ForceN: []float64{1}}); !errors.Is(err, reduce.ErrNoCalibration) {
		t.Errorf("no crosshead: %v", err)
	}
}
