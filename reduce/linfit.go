package reduce

import "math"

// sums accumulates the moments of a least-squares line y = a + b x. Points
// are shifted by an origin (x0, y0) before summing so that long records with
// large offsets keep full precision.
type sums struct {
	n                     float64
	sx, sy, sxx, sxy, syy float64
}

func (s *sums) add(x, y float64) {
	s.n++
	s.sx += x
	s.sy += y
	s.sxx += x * x
	s.sxy += x * y
	s.syy += y * y
}

func (s sums) minus(o sums) sums {
	return sums{s.n - o.n, s.sx - o.sx, s.sy - o.sy, s.sxx - o.sxx, s.sxy - o.sxy, s.syy - o.syy}
}

// line is a fitted straight line with the ASTM E111 statistics.
type line struct {
	slope, intercept float64
	r2               float64
	// v1Pct is the coefficient of variation of the slope, 100 x standard
	// error of the slope / slope (ASTM E111, from memory: equal to
	// 100 sqrt((1/r^2 - 1)/(K - 2))).
	v1Pct  float64
	points int
	// seSlope is the standard error of the slope.
	seSlope float64
}

// fit solves the least-squares line of the accumulated points. ok is false
// for fewer than 3 points or no spread in x.
func (s sums) fit() (l line, ok bool) {
	if s.n < 3 {
		return l, false
	}
	mx, my := s.sx/s.n, s.sy/s.n
	sxx := s.sxx - s.sx*mx
	sxy := s.sxy - s.sx*my
	syy := s.syy - s.sy*my
	if !(sxx > 0) || !(syy >= 0) {
		return l, false
	}
	l.slope = sxy / sxx
	l.intercept = my - l.slope*mx
	l.points = int(s.n)
	if syy > 0 {
		l.r2 = sxy * sxy / (sxx * syy)
	}
	sse := syy - l.slope*sxy
	if sse < 0 {
		sse = 0
	}
	if s.n > 2 {
		l.seSlope = math.Sqrt(sse / (s.n - 2) / sxx)
	}
	if l.slope != 0 {
		l.v1Pct = 100 * l.seSlope / math.Abs(l.slope)
	} else {
		l.v1Pct = math.Inf(1)
	}
	return l, true
}
