package reduce

import (
	"fmt"
	"math"
	"strconv"
)

// quantities assembles every quantity the data supports, in the order of
// the standards' tables, with method and expanded uncertainty.
func (w *work) quantities() []Quantity {
	q := []Quantity{}
	add := func(sym string, v float64, unit, method string, u float64) {
		if !finite(v) {
			return
		}
		q = append(q, Quantity{Symbol: sym, Value: v, Unit: unit, Method: method, U: expanded(u)})
	}
	rs := w.relUStress()
	strainName := "extensometer"
	if w.source == fromCrosshead {
		strainName = "crosshead (apparent)"
	}

	var e, uE float64
	if w.fitOK {
		e, uE = w.fit.slope, w.uE()
		m := fmt.Sprintf("ASTM E111 least squares, %s, %.0f-%.0f MPa, %d points, r2 %.5f, V1 %.3f %%",
			strainName, w.fitFromMPa, w.fitToMPa, w.fit.points, w.fit.r2, w.fit.v1Pct)
		if w.source == fromCrosshead {
			m = "apparent: " + m
		}
		add("E", e/1000, "GPa", m, uE/1000)
	}

	// Proof strengths.
	if w.fitOK {
		for _, p := range w.opt.ProofPct {
			rp, c := w.proof(p/100, e)
			if !c.ok {
				w.flag(FlagProofNotReached)
				continue
			}
			hiE, _ := w.proof(p/100, e+uE)
			loE, _ := w.proof(p/100, e-uE)
			uFromE := math.Abs(hiE-loE) / 2
			if !finite(uFromE) {
				uFromE = 0
			}
			uFromStrain := math.Abs(w.localSlopeMPa(c.i)) * w.uStrain(p/100)
			u := math.Sqrt(math.Pow(rs*rp, 2) + uFromE*uFromE + uFromStrain*uFromStrain)
			add("Rp"+pct(p), rp, "MPa", fmt.Sprintf("offset %s %% of Le, slope E (ASTM E8 offset method), %s", pct(p), strainName), u)
		}
	}
	if w.first >= 0 {
		for _, t := range w.opt.TotalPct {
			rt, c := w.totalProof(t / 100)
			if !c.ok {
				w.flag(FlagProofNotReached)
				continue
			}
			uFromStrain := math.Abs(w.localSlopeMPa(c.i)) * w.uStrain(t/100)
			add("Rt"+pct(t), rt, "MPa", fmt.Sprintf("total extension %s %% of Le, %s", pct(t), strainName), math.Hypot(rs*rt, uFromStrain))
		}
	}

	// Yield point.
	y := w.yieldPoint()
	yieldEnd := -1
	if y.ok {
		w.flag(FlagDiscontinuousYield)
		yieldEnd = y.endIndex
		add("ReH", y.reH, "MPa", "highest stress before the first marked force drop", rs*y.reH)
		m := "lowest stress in the yield range, initial transient ignored"
		if y.transientOnly {
			m = "lowest stress of the only dip after ReH"
		}
		add("ReL", y.reL, "MPa", m, rs*y.reL)
		add("Ae", 100*y.aeFrac, "%", "plastic extension from ReH to the start of uniform work hardening", 100*w.uStrain(y.aeFrac))
	}

	// Maximum.
	rm := w.fmN / w.s0MM2
	add("Fm", w.fmN, "N", "largest force reading", w.relUForce()*w.fmN)
	add("Rm", rm, "MPa", "Fm / S0", rs*rm)
	var agt float64 = nan
	if w.first >= 0 && finite(w.strain[w.iFm]) {
		t := w.top()
		agt = t.agtFrac
		uTop := t.reachFrac / sqrt3
		if t.widthFrac > 0.01 {
			w.flag(FlagFlatMaximum)
		}
		src := strainName
		if w.iRemoved >= 0 && w.iFm > w.iRemoved {
			src = "crosshead matched to the extensometer at its removal"
		}
		uAgt := math.Hypot(w.uStrainAt(t.i), uTop)
		how := fmt.Sprintf("at the force maximum with isolated spikes set down, top flat within noise over %.2f %% strain", 100*t.widthFrac)
		add("Agt", 100*agt, "%", "total extension at Fm, "+how+", "+src, 100*uAgt)
		if w.fitOK {
			ag := agt - rm/e
			add("Ag", 100*ag, "%", "plastic extension at Fm (Agt less Rm/E), "+how+", "+src,
				100*math.Hypot(uAgt, rm/e*uE/e))
		}
	}

	// Fracture.
	xb, sb := w.strain[w.iBreak], w.stress[w.iBreak]
	if w.first >= 0 && finite(xb) {
		src := strainName
		if w.iRemoved >= 0 && w.iBreak > w.iRemoved {
			src = "crosshead matched to the extensometer at its removal"
		}
		add("At", 100*xb, "%", "total extension at fracture, "+src, 100*w.uStrainAt(w.iBreak))
	}
	if w.sp.LuMM > 0 && w.l0MM > 0 {
		a := 100 * (w.sp.LuMM - w.l0MM) / w.l0MM
		u := 100 * math.Hypot(w.opt.LengthUMM, w.sp.LuMM/w.l0MM*w.opt.LengthUMM) / w.l0MM
		add("A", a, "%", "from Lu, 100 (Lu - L0) / L0", u)
	} else if w.fitOK && finite(xb) && finite(sb) {
		w.flag(FlagAFromExtension)
		a := xb - sb/e
		add("A", 100*a, "%", "from the extension at fracture over Le less the elastic recovery (stress / E), "+src(w), 100*math.Hypot(w.uStrainAt(w.iBreak), sb/e*uE/e))
	}
	if su, uSu := w.sp.finalSectionMM2(w.opt.DimensionUMM); su > 0 {
		z := 100 * (w.s0MM2 - su) / w.s0MM2
		u := 100 * su / w.s0MM2 * math.Hypot(uSu, w.sp.relUS0(w.opt.DimensionUMM))
		add("Z", z, "%", "100 (S0 - Su) / S0", u)
	}

	// Hardening and energy.
	if w.fitOK && finite(agt) {
		h := w.hardening(agt, yieldEnd)
		if h.ok {
			if h.fallbackUsed || h.points < 5 {
				w.flag(FlagHardeningRangeShort)
			}
			add("n", h.n, "1", h.method(), h.uN)
			add("K", h.k, "MPa", h.method(), h.k*math.Hypot(h.uRelK, rs))
		}
	}
	if wf := w.energyMJPerM3(); finite(wf) {
		add("W", wf, "MJ/m3", "work of fracture per unit volume: area under the engineering curve to fracture, "+src(w),
			wf*math.Hypot(rs, w.relUStrainScale()))
	}
	return q
}

func src(w *work) string {
	if w.source == fromCrosshead {
		return "crosshead (apparent)"
	}
	if w.iRemoved >= 0 {
		return "extensometer, then crosshead matched at its removal"
	}
	return "extensometer"
}

// pct formats a percentage for a symbol: 0.2 -> "0.2", 1 -> "1".
func pct(p float64) string { return strconv.FormatFloat(p, 'f', -1, 64) }
