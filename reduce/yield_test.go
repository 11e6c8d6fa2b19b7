package reduce_test

import (
	"math"
	"testing"

	"framed/reduce"
)

// yieldPointSteel is a piecewise engineering curve of a steel with a yield
// point: elastic to ReH, an initial transient dip, a serrated Lueders
// plateau whose lowest stress is ReL, then parabolic hardening to Rm.
// Shape after ISO 6892-1's figures of discontinuous yielding (common
// practice); the numbers are chosen, so every answer is exact.
type yieldPointSteel struct {
	eMPa, reH, dip, plateau, amp, hMPa, cMPa float64
	luedersFrac, periodFrac                  float64
}

func (y yieldPointSteel) eH() float64 { return y.reH / y.eMPa }

// eHard is where uniform hardening starts.
func (y yieldPointSteel) eHard() float64 { return y.eH() + y.luedersFrac }

func (y yieldPointSteel) stress(e float64) float64 {
	eH := y.eH()
	switch {
	case e <= eH:
		return y.eMPa * e
	case e <= eH+0.0005: // the transient: down to the dip
		return y.reH + (y.dip-y.reH)*(e-eH)/0.0005
	case e <= eH+0.001: // back up to the plateau
		return y.dip + (y.plateau-y.dip)*(e-eH-0.0005)/0.0005
	case e <= y.eHard(): // serrations: triangle wave of amplitude amp
		ph := math.Mod((e-eH-0.001)/y.periodFrac, 1)
		tri := 1 - 4*math.Abs(ph-0.5) // -1 .. 1, 1 at mid-period
		return y.plateau - y.amp*tri
	default:
		d := e - y.eHard()
		return y.plateau + y.hMPa*d - y.cMPa*d*d
	}
}

func TestYieldPointWithTransient(t *testing.T) {
	y := yieldPointSteel{eMPa: 205000, reH: 380, dip: 350, plateau: 365, amp: 3,
		hMPa: 2000, cMPa: 6000, luedersFrac: 0.02, periodFrac: 0.002}
	// Knots at ReH, the dip and every serration's lowest point, so the
	// extremes are sampled exactly.
	knots := []float64{y.eH(), y.eH() + 0.0005, y.eH() + 0.001, y.eHard()}
	for k := 0.0; y.eH()+0.001+(k+0.5)*y.periodFrac < y.eHard(); k++ {
		knots = append(knots, y.eH()+0.001+(k+0.5)*y.periodFrac)
	}
	eMax := y.eHard() + 0.25
	rm := y.plateau + y.hMPa*y.hMPa/(4*y.cMPa)
	agt := y.eHard() + y.hMPa/(2*y.cMPa)
	reL := y.plateau - y.amp
	ae := y.eHard() - y.plateau/y.eMPa // plastic strain at the start of hardening; 0 at ReH

	for _, noisy := range []bool{false, true} {
		s := synthSpec{s0MM2: 100, leMM: 50, samples: 30000, eMax: eMax, stress: y.stress, seed: 5, knots: knots, breakDrop: true}
		// Ae is reported to 0.1 % (ISO 6892-1 rounding, from memory); the
		// regression line over the curved start of hardening meets the
		// plateau a little early, so allow half of that.
		tolMPa, tolAePP := 1e-6, 0.05
		if noisy {
			s.forceSDN, s.forceStepN, s.extSDMM, s.extStepMM = 5, 1, 0.0003, 0.0001
			tolMPa, tolAePP = 0.5, 0.05
		}
		res, err := reduce.Reduce(s.curve(), reduce.Specimen{S0MM2: 100, L0MM: 50}, reduce.Detected{}, reduce.Options{})
		if err != nil {
			t.Fatal(err)
		}
		check := func(sym string, want, tol float64) {
			t.Helper()
			q, ok := quantity(res, sym)
			if !ok {
				t.Errorf("noisy=%v: %s missing (flags %v)", noisy, sym, res.Flags)
				return
			}
			if !(math.Abs(q.Value-want) <= tol) {
				t.Errorf("noisy=%v: %s = %.4f, want %.4f +- %.3g (%s)", noisy, sym, q.Value, want, tol, q.Method)
			}
		}
		check("ReH", y.reH, tolMPa+2*5/100.0)
		// ReL is the lowest serration, not the transient dip (350).
		check("ReL", reL, tolMPa+2*5/100.0)
		check("Ae", 100*ae, tolAePP)
		check("Rm", rm, tolMPa)
		check("E", y.eMPa/1000, 0.02*y.eMPa/1000)
		if !noisy {
			check("Agt", 100*agt, 0.01)
		}
		if !hasFlag(res, reduce.FlagDiscontinuousYield) {
			t.Errorf("noisy=%v: no discontinuous-yield flag", noisy)
		}
	}
}
