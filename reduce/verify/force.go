package verify

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"
)

// ForceReport is the outcome of a force verification. Its JSON form is the
// document `framectl verify --json` prints; the names points, reference_N,
// q_pct, b_pct, v_pct, a_pct, class, f0_pct, ranges, from_N, to_N and
// astm_e4_pass are a contract: extend, never rename.
type ForceReport struct {
	Points []Point `json:"points"`
	// F0Pct is the relative zero error f0 = 100 Fi0 / FN.
	F0Pct float64 `json:"f0_pct"`
	// F0Class is the best class whose f0 limit f0 meets.
	F0Class Class `json:"f0_class"`
	// Ranges holds, for each verified force taken as the lower end, the
	// best class met by every point from there to the top and by f0.
	Ranges []Range `json:"ranges"`
	// ASTME4Pass is the ASTM E4 accuracy criterion: every point's |q| is
	// within 1 %. The other ASTM E4 conditions are in ASTME4Checks.
	ASTME4Pass bool `json:"astm_e4_pass"`
	// ASTME4Checks lists every ASTM E4 condition checked, passed or not.
	ASTME4Checks []Check `json:"astm_e4_checks"`
	// ASTME4Reasons says, in words, why a condition failed (empty if none).
	ASTME4Reasons []string `json:"astm_e4_reasons"`
	// ResolutionN and ZeroAfterN echo the inputs.
	ResolutionN float64 `json:"resolution_N"`
	ZeroAfterN  float64 `json:"zero_after_N"`
}

// Point is one reference force's errors, in percent of the reference force.
type Point struct {
	ReferenceN float64 `json:"reference_N"`
	// QPct is the relative accuracy error over the increasing series; nil
	// when the point has no increasing reading.
	QPct *float64 `json:"q_pct"`
	// BPct is the relative repeatability error; nil with fewer than two
	// increasing readings.
	BPct *float64 `json:"b_pct"`
	// VPct is the relative reversibility error (decreasing run minus series
	// 3); nil when it was not measured at this force.
	VPct *float64 `json:"v_pct"`
	// APct is the relative resolution.
	APct float64 `json:"a_pct"`
	// Class is the best class whose limits q, b, a and (when measured) v
	// all meet; NoClass (null) when none, or when a series is missing.
	Class Class `json:"class"`
	// Series lists the increasing series read at this force.
	Series []string `json:"series"`
	// Reasons say what keeps the point from the next better class (or from
	// any class).
	Reasons []string `json:"reasons"`
}

// Range is a measuring range from a verified force up to the top force.
type Range struct {
	FromN float64 `json:"from_N"`
	ToN   float64 `json:"to_N"`
	Class Class   `json:"class"`
}

// Check is one named condition and whether it holds.
type Check struct {
	Name   string `json:"name"`
	Pass   bool   `json:"pass"`
	Detail string `json:"detail"`
}

// ClassifyForce computes ISO 7500-1 errors and classes, and the ASTM E4
// criteria, from verification readings. resolutionN is the resolution r of
// the force indicator (N, positive; see Resolution when the unloaded
// reading fluctuates); zeroAfterN is the residual indication Fi0 after
// unloading (N).
//
// Readings at the same reference force (exactly equal values) form one
// point. Each point needs series 1, 2 and 3 to be classed; with a series
// missing, q and b are still computed from what was read but the class is
// null, because ISO 7500-1 classes a force from three series.
func ClassifyForce(readings []Reading, resolutionN, zeroAfterN float64) (ForceReport, error) {
	if len(readings) == 0 {
		return ForceReport{}, ErrNoReadings
	}
	if math.IsNaN(resolutionN) || math.IsInf(resolutionN, 0) || resolutionN <= 0 {
		return ForceReport{}, fmt.Errorf("%w: %v N must be positive and finite", ErrBadResolution, resolutionN)
	}
	if math.IsNaN(zeroAfterN) || math.IsInf(zeroAfterN, 0) {
		return ForceReport{}, fmt.Errorf("%w: %v N must be finite", ErrBadZero, zeroAfterN)
	}
	groups, err := groupByReference(readings)
	if err != nil {
		return ForceReport{}, err
	}
	rep := ForceReport{ResolutionN: resolutionN, ZeroAfterN: zeroAfterN}
	for _, g := range groups {
		p := classifyPoint(g, resolutionN)
		if err := p.finite(); err != nil {
			return ForceReport{}, err
		}
		rep.Points = append(rep.Points, p)
	}
	topN := groups[len(groups)-1].referenceN
	rep.F0Pct = 100 * zeroAfterN / topN
	if !finite(rep.F0Pct) {
		return ForceReport{}, fmt.Errorf("%w: f0 = 100 x %v / %v N is out of range", ErrBadNumber, zeroAfterN, topN)
	}
	rep.F0Class = NoClass
	for _, l := range ForceLimits { // FROM MEMORY: f0 limits of ForceLimits
		if within(rep.F0Pct, l.F0Pct) {
			rep.F0Class = l.Class
			break
		}
	}
	// Ranges: walk down from the top so each range's class is the worse of
	// its lowest point and the range just above it.
	rep.Ranges = make([]Range, len(rep.Points))
	cls := rep.F0Class
	for i := len(rep.Points) - 1; i >= 0; i-- {
		cls = cls.Worse(rep.Points[i].Class)
		rep.Ranges[i] = Range{FromN: rep.Points[i].ReferenceN, ToN: topN, Class: cls}
	}
	astmE4(&rep)
	return rep, nil
}

// point collects the readings at one reference force.
type point struct {
	referenceN float64
	inc        [3]*float64 // series 1..3
	dec        *float64
}

func groupByReference(readings []Reading) ([]point, error) {
	byRef := map[float64]*point{}
	for i, r := range readings {
		if err := r.check(); err != nil {
			return nil, fmt.Errorf("reading %d: %w", i+1, err)
		}
		p := byRef[r.ReferenceN]
		if p == nil {
			p = &point{referenceN: r.ReferenceN}
			byRef[r.ReferenceN] = p
		}
		slot := &p.dec
		if r.Series != Decreasing {
			slot = &p.inc[r.Series-1]
		}
		if *slot != nil {
			return nil, fmt.Errorf("%w: series %s at %v N read twice", ErrDuplicate, r.Series, r.ReferenceN)
		}
		v := r.IndicatedN
		*slot = &v
	}
	out := make([]point, 0, len(byRef))
	for _, p := range byRef {
		out = append(out, *p)
	}
	slices.SortFunc(out, func(a, b point) int { return cmp.Compare(a.referenceN, b.referenceN) })
	return out, nil
}

func classifyPoint(g point, resolutionN float64) Point {
	F := g.referenceN
	p := Point{ReferenceN: F, APct: 100 * resolutionN / F, Series: []string{}, Reasons: []string{}}
	var sum, lo, hi float64
	n := 0
	var missing []string
	for s, v := range g.inc {
		if v == nil {
			missing = append(missing, Series(s+1).String())
			continue
		}
		p.Series = append(p.Series, Series(s+1).String())
		if n == 0 {
			lo, hi = *v, *v
		}
		sum += *v
		lo, hi = min(lo, *v), max(hi, *v)
		n++
	}
	if n > 0 {
		q := 100 * (sum/float64(n) - F) / F
		p.QPct = &q
	}
	if n > 1 {
		b := 100 * (hi - lo) / F
		p.BPct = &b
	}
	if g.dec != nil {
		if g.inc[2] != nil {
			v := 100 * (*g.dec - *g.inc[2]) / F
			p.VPct = &v
		} else {
			p.Reasons = append(p.Reasons, "decreasing reading without series 3: reversibility not computed")
		}
	}
	if len(missing) > 0 {
		p.Class = NoClass
		p.Reasons = append(p.Reasons, fmt.Sprintf("series %s missing: ISO 7500-1 classes a force from three increasing series", strings.Join(missing, ", ")))
		return p
	}
	// FROM MEMORY: the class limits come from ForceLimits.
	p.Class = NoClass
	for i, l := range ForceLimits {
		fails := pointExceeds(p, l)
		if len(fails) == 0 {
			p.Class = l.Class
			if i > 0 {
				p.Reasons = append(p.Reasons, pointExceeds(p, ForceLimits[i-1])...)
			}
			return p
		}
	}
	p.Reasons = append(p.Reasons, pointExceeds(p, ForceLimits[len(ForceLimits)-1])...)
	return p
}

// finite refuses a point whose errors overflowed: readings so far apart
// in magnitude (1e-300 N against 1e300 N) that a percentage is infinite.
// They are no verification and cannot be written as JSON.
func (p Point) finite() error {
	for _, v := range []*float64{p.QPct, p.BPct, p.VPct, &p.APct} {
		if v != nil && !finite(*v) {
			return fmt.Errorf("%w: errors at %v N are out of range", ErrBadNumber, p.ReferenceN)
		}
	}
	return nil
}

// pointExceeds lists which of the point's errors exceed class l's limits.
func pointExceeds(p Point, l ForceLimit) []string {
	var out []string
	if p.QPct != nil && !within(*p.QPct, l.QPct) {
		out = append(out, fmt.Sprintf("q %+.3f %% exceeds class %s limit ±%g %%", *p.QPct, l.Class, l.QPct))
	}
	if p.BPct != nil && !within(*p.BPct, l.BPct) {
		out = append(out, fmt.Sprintf("b %.3f %% exceeds class %s limit %g %%", *p.BPct, l.Class, l.BPct))
	}
	if p.VPct != nil && !within(*p.VPct, l.VPct) {
		out = append(out, fmt.Sprintf("v %+.3f %% exceeds class %s limit ±%g %%", *p.VPct, l.Class, l.VPct))
	}
	if !within(p.APct, l.APct) {
		out = append(out, fmt.Sprintf("a %.3f %% exceeds class %s limit %g %%", p.APct, l.Class, l.APct))
	}
	return out
}
