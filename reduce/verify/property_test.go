package verify

import (
	"math"
	"reflect"
	"testing"

	"pgregory.net/rapid"
)

// genVerification draws a plausible verification: 1 to 8 distinct forces
// from 10 N to 1 MN, three series each within ±5 % (some series left out),
// sometimes a decreasing reading, a resolution and a zero reading.
func genVerification(t *rapid.T) (rd []Reading, resN, zeroN float64) {
	forces := rapid.SliceOfNDistinct(rapid.Float64Range(10, 1e6), 1, 8, func(f float64) float64 { return f }).Draw(t, "forces")
	for _, F := range forces {
		for s := Series1; s <= Decreasing; s++ {
			if rapid.IntRange(0, 9).Draw(t, "skip") == 0 {
				continue
			}
			e := rapid.Float64Range(-0.05, 0.05).Draw(t, "err")
			rd = append(rd, Reading{Series: s, ReferenceN: F, IndicatedN: F * (1 + e)})
		}
	}
	if len(rd) == 0 {
		rd = append(rd, Reading{Series: Series1, ReferenceN: forces[0], IndicatedN: forces[0]})
	}
	resN = rapid.Float64Range(1e-3, 50).Draw(t, "resolution")
	zeroN = rapid.Float64Range(-100, 100).Draw(t, "zero")
	return rd, resN, zeroN
}

// Percent errors do not depend on the unit of force: scaling every force
// by a power of two (exact in binary) gives bit-identical percentages and
// the same classes.
func TestPropertyScaleInvariant(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		rd, resN, zeroN := genVerification(t)
		k := math.Ldexp(1, rapid.IntRange(-10, 10).Draw(t, "exp"))
		scaled := make([]Reading, len(rd))
		for i, r := range rd {
			scaled[i] = Reading{Series: r.Series, ReferenceN: k * r.ReferenceN, IndicatedN: k * r.IndicatedN}
		}
		a, err := ClassifyForce(rd, resN, zeroN)
		if err != nil {
			t.Fatal(err)
		}
		b, err := ClassifyForce(scaled, k*resN, k*zeroN)
		if err != nil {
			t.Fatal(err)
		}
		if a.F0Pct != b.F0Pct || a.ASTME4Pass != b.ASTME4Pass || len(a.Points) != len(b.Points) {
			t.Fatalf("f0 %v/%v, E4 %v/%v", a.F0Pct, b.F0Pct, a.ASTME4Pass, b.ASTME4Pass)
		}
		for i := range a.Points {
			pa, pb := a.Points[i], b.Points[i]
			if !reflect.DeepEqual(pa.QPct, pb.QPct) || !reflect.DeepEqual(pa.BPct, pb.BPct) ||
				!reflect.DeepEqual(pa.VPct, pb.VPct) || pa.APct != pb.APct || pa.Class != pb.Class {
				t.Fatalf("point %d: %+v vs %+v", i, pa, pb)
			}
			if a.Ranges[i].Class != b.Ranges[i].Class {
				t.Fatalf("range %d class %v vs %v", i, a.Ranges[i].Class, b.Ranges[i].Class)
			}
		}
	})
}

// The order of lines in a readings file does not matter.
func TestPropertyOrderInvariant(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		rd, resN, zeroN := genVerification(t)
		perm := rapid.Permutation(rd).Draw(t, "perm")
		a, err := ClassifyForce(rd, resN, zeroN)
		if err != nil {
			t.Fatal(err)
		}
		b, err := ClassifyForce(perm, resN, zeroN)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(a, b) {
			t.Fatalf("order changed the report:\n%+v\n%+v", a, b)
		}
	})
}

// A range is never better than a range starting higher up, nor than its
// own lower-end point or f0; and a point's class holds every limit of that
// class in the table (FROM MEMORY) while missing the next better one.
func TestPropertyClassesConsistent(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		rd, resN, zeroN := genVerification(t)
		rep, err := ClassifyForce(rd, resN, zeroN)
		if err != nil {
			t.Fatal(err)
		}
		for i, r := range rep.Ranges {
			if r.Class != r.Class.Worse(rep.Points[i].Class) || r.Class != r.Class.Worse(rep.F0Class) {
				t.Fatalf("range %d class %v better than point %v or f0 %v", i, r.Class, rep.Points[i].Class, rep.F0Class)
			}
			if i+1 < len(rep.Ranges) && r.Class != r.Class.Worse(rep.Ranges[i+1].Class) {
				t.Fatalf("range %d class %v better than range above %v", i, r.Class, rep.Ranges[i+1].Class)
			}
		}
		for _, p := range rep.Points {
			if p.Class == NoClass {
				continue
			}
			for j, l := range ForceLimits {
				if l.Class == p.Class {
					if len(pointExceeds(p, l)) != 0 {
						t.Fatalf("point %+v breaks its own class", p)
					}
					if j > 0 && len(pointExceeds(p, ForceLimits[j-1])) == 0 {
						t.Fatalf("point %+v also meets class %v", p, ForceLimits[j-1].Class)
					}
				}
			}
			if p.QPct == nil || p.BPct == nil || len(p.Series) != 3 {
				t.Fatalf("classed point without three series: %+v", p)
			}
		}
	})
}
