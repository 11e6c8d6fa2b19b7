// Reference-curve checks: every curve in the shared reference folder is
// reduced and compared with its publisher's reported values.
//
// Sources (both CC BY 4.0, converted to the curve file format; see the
// folder's README):
//   - 42CrMoS4/: Platform MaterialDigital, "demodata_tensiletest_42CrMoS4"
//     (Fraunhofer IWM with IWT Bremen), tested to DIN EN ISO 6892-1.
//   - S355/: Platform MaterialDigital "tensile-test-ontology" example data,
//     tests by the Bundesanstalt fuer Materialforschung und -pruefung (BAM),
//     published on Zenodo (record 6778336).
//
// The tolerances are the project's acceptance limits for reduction; they
// are applied to whatever reported.csv rows are present, so a curve dropped
// into the folder with its reported row is checked too.
package reduce_test

import (
	"math"
	"sort"
	"testing"

	"framed/reduce"
)

func quantity(res reduce.Result, sym string) (reduce.Quantity, bool) {
	for _, q := range res.Quantities {
		if q.Symbol == sym {
			return q, true
		}
	}
	return reduce.Quantity{}, false
}

func median(v []float64) float64 {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	if len(s) == 0 {
		return math.NaN()
	}
	if len(s)%2 == 1 {
		return s[len(s)/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}

func TestReferenceCurves(t *testing.T) {
	cases := loadReference(t)
	var rpDev []float64
	eDev := map[string][]float64{}
	covered, withE := 0, 0
	for _, rc := range cases {
		res, err := reduce.Reduce(rc.curve, rc.sp, reduce.Detected{}, reduce.Options{})
		if err != nil {
			t.Errorf("%s/%s: %v", rc.set, rc.id, err)
			continue
		}
		get := func(sym string) reduce.Quantity {
			q, ok := quantity(res, sym)
			if !ok {
				t.Errorf("%s/%s: %s missing (flags %v)", rc.set, rc.id, sym, res.Flags)
				q.Value = math.NaN()
			}
			return q
		}
		rep := func(col string) (float64, bool) { v, ok := rc.rep[col]; return v, ok }
		relDev := func(got, want float64) float64 { return 100 * math.Abs(got/want-1) }

		// Rm within 0.1 % (acceptance limit).
		if want, ok := rep("Rm_MPa"); ok {
			if d := relDev(get("Rm").Value, want); !(d <= 0.1) {
				t.Errorf("%s: Rm %.2f vs reported %.2f (%.3f %%)", rc.id, get("Rm").Value, want, d)
			}
		}
		if want, ok := rep("Fm_N"); ok {
			if d := relDev(get("Fm").Value, want); !(d <= 0.1) {
				t.Errorf("%s: Fm %.0f vs reported %.0f (%.3f %%)", rc.id, get("Fm").Value, want, d)
			}
		}
		// Rp0.2 within 0.5 %, median over all curves within 0.15 %.
		if want, ok := rep("Rp0.2_MPa"); ok {
			d := relDev(get("Rp0.2").Value, want)
			rpDev = append(rpDev, d)
			if !(d <= 0.5) {
				t.Errorf("%s: Rp0.2 %.1f vs reported %.1f (%.3f %%)", rc.id, get("Rp0.2").Value, want, d)
			}
		}
		if want, ok := rep("Rp1_MPa"); ok {
			if d := relDev(get("Rp1").Value, want); !(d <= 0.5) {
				t.Errorf("%s: Rp1 %.1f vs reported %.1f (%.3f %%)", rc.id, get("Rp1").Value, want, d)
			}
		}
		// ReH within 0.5 %.
		if want, ok := rep("ReH_MPa"); ok {
			if d := relDev(get("ReH").Value, want); !(d <= 0.5) {
				t.Errorf("%s: ReH %.1f vs reported %.1f (%.3f %%)", rc.id, get("ReH").Value, want, d)
			}
		}
		// Ag within 0.2 percentage points. Where the reported Ag sits on an
		// isolated force spike (one reading far above both neighbours), the
		// reported value is the spike's position, which our reduction
		// deliberately ignores; there our stated U must cover it instead.
		if want, ok := rep("Ag_pct"); ok {
			q := get("Ag")
			if d := math.Abs(q.Value - want); !(d <= 0.2) {
				if spikeAtReportedAg(rc, res) && q.U != nil && d <= *q.U {
					t.Logf("%s: reported Ag %.3f is at an isolated force spike; ours %.3f, U %.3f covers it", rc.id, want, q.Value, *q.U)
				} else {
					t.Errorf("%s: Ag %.3f vs reported %.3f", rc.id, q.Value, want)
				}
			}
		}
		// A within 0.2 percentage points: 42CrMoS4 from the extension at
		// fracture (no Lu given), S355 from Lu against a reported A rounded to
		// 0.5 % (so within the rounding half-step 0.25).
		if want, ok := rep("A_pct"); ok {
			q := get("A")
			tol := 0.2
			if _, hasLu := rep("Lu_mm"); hasLu {
				tol = 0.25
			}
			if d := math.Abs(q.Value - want); !(d <= tol) {
				t.Errorf("%s: A %.3f vs reported %.3f (%s)", rc.id, q.Value, want, q.Method)
			}
		}
		// After an extensometer removal, At comes from the crosshead matched
		// to the extensometer; less the elastic recovery it must agree with
		// the A the publisher measured from Lu, within the stated U of At.
		if wantA, ok := rep("A_pct"); ok && hasFlag(res, reduce.FlagExtensometerRemoved) {
			at, e := get("At"), get("E")
			var fBreak float64
			for _, ev := range res.Events {
				if ev.Kind == reduce.EventBreak && ev.ForceN != nil {
					fBreak = *ev.ForceN
				}
			}
			s0, _ := rc.sp.CrossSectionMM2()
			a := at.Value - 100*fBreak/s0/(e.Value*1000)
			if at.U == nil || !(math.Abs(a-wantA) <= *at.U+0.25) {
				t.Errorf("%s: At %.2f less recovery %.2f vs reported A %.1f (U %v)", rc.id, at.Value, a, wantA, at.U)
			}
		}
		// Z from Su as defined, 100 (S0 - Su) / S0, and against the reported
		// Z (S355 rounds Z to 1 %).
		if su, ok := rep("Su_mm2"); ok {
			s0, _ := rc.sp.CrossSectionMM2()
			z := get("Z").Value
			if d := math.Abs(z - 100*(s0-su)/s0); !(d < 1e-9) {
				t.Errorf("%s: Z %.4f is not 100 (S0 - Su) / S0", rc.id, z)
			}
			if want, ok := rep("Z_pct"); ok && !(math.Abs(z-want) <= 0.51) {
				t.Errorf("%s: Z %.2f vs reported %.2f", rc.id, z, want)
			}
		}
		// E within 5 % (42CrMoS4, median 2 %) or 2 % (S355) of the reported
		// value; the stated U must cover the reported E on 9 curves in 10.
		wantE, okE := rep("E_MPa")
		if okE {
			wantE /= 1000
		} else if wantE, okE = rep("E_GPa"); !okE {
			continue
		}
		q := get("E")
		d := relDev(q.Value, wantE)
		eDev[rc.set] = append(eDev[rc.set], d)
		limit := 5.0
		if rc.set == "S355" {
			limit = 2
		}
		if !(d <= limit) {
			t.Errorf("%s: E %.1f GPa vs reported %.1f (%.2f %%, %s)", rc.id, q.Value, wantE, d, q.Method)
		}
		withE++
		if q.U != nil && math.Abs(q.Value-wantE) <= *q.U {
			covered++
		} else {
			t.Logf("%s: E %.1f +- %.1f does not cover reported %.1f", rc.id, q.Value, *q.U, wantE)
		}
	}
	if m := median(rpDev); !(m <= 0.15) {
		t.Errorf("median Rp0.2 deviation %.3f %%, want <= 0.15 %%", m)
	}
	if m := median(eDev["42CrMoS4"]); len(eDev["42CrMoS4"]) > 0 && !(m <= 2) {
		t.Errorf("median 42CrMoS4 E deviation %.2f %%, want <= 2 %%", m)
	}
	if withE > 0 && !(float64(covered) >= 0.9*float64(withE)) {
		t.Errorf("U(E) covers the reported E on %d of %d curves, want 9 in 10", covered, withE)
	}
	t.Logf("%d curves; median Rp0.2 dev %.3f %%; median E dev %v; U(E) covers %d/%d",
		len(cases), median(rpDev), map[string]float64{"42CrMoS4": median(eDev["42CrMoS4"]), "S355": median(eDev["S355"])}, covered, withE)
}

func hasFlag(res reduce.Result, f string) bool {
	for _, g := range res.Flags {
		if g == f {
			return true
		}
	}
	return false
}

// spikeAtReportedAg tells whether the force sample where the reported Ag
// lies (the sample whose plastic extension is nearest to it) is an isolated
// spike: more than 5 noise deviations above both neighbours, the noise taken
// as the median absolute second difference of the force near the top.
func spikeAtReportedAg(rc refCase, res reduce.Result) bool {
	e, ok := quantity(res, "E")
	rm, ok2 := quantity(res, "Rm")
	s0, err := rc.sp.CrossSectionMM2()
	if !ok || !ok2 || err != nil {
		return false
	}
	f, x := rc.curve.ForceN, rc.curve.ExtensionMM
	want := rc.rep["Ag_pct"]
	best, bi := math.Inf(1), -1
	for i := range f {
		if math.IsNaN(x[i]) || f[i] < 0.98*rm.Value*s0 {
			continue
		}
		ag := 100 * (x[i]/rc.sp.LeMM - f[i]/s0/(e.Value*1000))
		if d := math.Abs(ag - want); d < best {
			best, bi = d, i
		}
	}
	// The reported position is the force maximum near that sample.
	for i := max(1, bi-2); i <= min(len(f)-2, bi+2); i++ {
		if f[i] > f[bi] {
			bi = i
		}
	}
	if bi < 1 || bi >= len(f)-1 {
		return false
	}
	var d2 []float64
	for i := max(1, bi-50); i < min(len(f)-1, bi+50); i++ {
		d2 = append(d2, math.Abs(f[i+1]-2*f[i]+f[i-1]))
	}
	sigma := median(d2) / 0.6745 / math.Sqrt(6)
	return f[bi]-f[bi-1] > 5*sigma && f[bi]-f[bi+1] > 5*sigma
}
