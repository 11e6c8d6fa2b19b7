package sim

import "math"

// rateRun is a specimen pulled at a constant crosshead rate through a
// load train of stiffness k. The crosshead travel x is shared between the
// specimen and the train: x = e Lc + F/k. Where that sum falls with
// strain (a yield drop, or necking on a soft frame) the specimen jumps
// forward to the next strain that matches x, as a real one does.
type rateRun struct {
	tab      table
	g        []float64 // x at each table point, mm
	j        int       // table cell of the current state
	vMMPerS  float64
	v2MMPerS float64 // after the rate change
	changeE  float64 // strain of the rate change; +Inf none
	eNow     float64
	s0MM2    float64
	leMM     float64
	extOffE  float64 // strain at which the extensometer comes off; +Inf never

	xMM    float64
	broken bool
	extOff bool
}

func newRateRun(sp Specimen) *rateRun {
	c := sp.Material.compile()
	r := &rateRun{
		tab:     newTable(c),
		vMMPerS: sp.Loading.CrossheadMMPerMin / 60,
		changeE: math.Inf(1),
		s0MM2:   sp.CrossSectionMM2(),
		leMM:    sp.leMM(),
		extOffE: math.Inf(1),
	}
	if p := sp.Loading.ExtensometerOffPct; p > 0 {
		r.extOffE = p / 100
	}
	if p := sp.Loading.RateChangePct; p > 0 {
		r.changeE = p / 100
		r.v2MMPerS = sp.Loading.CrossheadAfterMMPerMin / 60
	}
	lc, k := sp.lcMM(), sp.Loading.StiffnessNPerMM
	r.g = make([]float64, len(r.tab.e))
	for i := range r.g {
		r.g[i] = r.tab.e[i]*lc + r.s0MM2*r.tab.s[i]/k
	}
	return r
}

// step advances test time by dtS and returns the true state.
func (r *rateRun) step(dtS float64) (sample, bool) {
	v := r.vMMPerS
	if r.eNow >= r.changeE {
		v = r.v2MMPerS
	}
	r.xMM += v * dtS
	n := r.tab.last()
	for r.j < n && r.g[r.j+1] < r.xMM {
		r.j++
	}
	if r.j >= n {
		r.broken = true
		return sample{forceN: 0, extMM: math.NaN(), crossMM: r.xMM}, true
	}
	g0, g1 := r.g[r.j], r.g[r.j+1]
	f := 0.0
	if g1 > g0 {
		f = min(max((r.xMM-g0)/(g1-g0), 0), 1)
	}
	e := r.tab.e[r.j] + f*(r.tab.e[r.j+1]-r.tab.e[r.j])
	s := r.tab.s[r.j] + f*(r.tab.s[r.j+1]-r.tab.s[r.j])
	r.eNow = e
	out := sample{forceN: s * r.s0MM2, extMM: e * r.leMM, crossMM: r.xMM}
	if e >= r.extOffE {
		r.extOff = true
	}
	if r.extOff {
		out.extMM = math.NaN()
	}
	return out, false
}
