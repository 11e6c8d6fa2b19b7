package reduce

import "math"

// sums accumulates the moments of a least-squares line y = a + b x. Points
// are shifted by an origin (x0, y0) before summing so that long records with
// large offsets keep full precision.
type sums struct {
	n                     float64
	sx, sy, sxx, sxy, syy float64
	// Higher moments for the curvature test (quadratic fit).
	sx3, sx4, sx2y float64
}

func (s *sums) add(x, y float64) {
	s.n++
	s.sx += x
	s.sy += y
	s.sxx += x * x
	s.sxy += x * y
	s.syy += y * y
	x2 := x * x
	s.sx3 += x2 * x
	s.sx4 += x2 * x2
	s.sx2y += x2 * y
}

func (s sums) minus(o sums) sums {
	return sums{s.n - o.n, s.sx - o.sx, s.sy - o.sy, s.sxx - o.sxx, s.sxy - o.sxy, s.syy - o.syy,
		s.sx3 - o.sx3, s.sx4 - o.sx4, s.sx2y - o.sx2y}
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

// bend measures how far the points bend away from a straight line: the
// quadratic y = a + b x + c x^2 is fitted, and bend returns the relative
// change of its slope across the x range of the points, |2 c dx| / b, and
// the F statistic of the quadratic term (its significance against noise).
// A window is straight when either is small.
func (s sums) bend(xMin, xMax float64) (relChange, f float64, ok bool) {
	if s.n < 5 {
		return 0, 0, false
	}
	m := [5]float64{s.n, s.sx, s.sxx, s.sx3, s.sx4}
	r := [3]float64{s.sy, s.sxy, s.sx2y}
	a, b, c, ok := solve3(m, r)
	if !ok {
		return 0, 0, false
	}
	l, ok := s.fit()
	if !ok || l.slope == 0 {
		return 0, 0, false
	}
	// Slope of the quadratic at the middle of the range.
	mid := (xMin + xMax) / 2
	slope := b + 2*c*mid
	if slope == 0 {
		return 0, 0, false
	}
	relChange = math.Abs(2 * c * (xMax - xMin) / slope)
	// SSE of the line and of the quadratic.
	my := s.sy / s.n
	sxy := s.sxy - s.sx*my
	syy := s.syy - s.sy*my
	sseLin := syy - l.slope*sxy
	sseQ := s.syy - a*s.sy - b*s.sxy - c*s.sx2y
	if sseQ <= 0 {
		return relChange, math.Inf(1), true
	}
	f = (sseLin - sseQ) / (sseQ / (s.n - 3))
	return relChange, f, true
}

// solve3 solves the normal equations of a quadratic least-squares fit
// from the moments m[k] = sum x^k and r[k] = sum x^k y by Cramer's rule.
func solve3(m [5]float64, r [3]float64) (a, b, c float64, ok bool) {
	A := [3][3]float64{{m[0], m[1], m[2]}, {m[1], m[2], m[3]}, {m[2], m[3], m[4]}}
	det := func(M [3][3]float64) float64 {
		return M[0][0]*(M[1][1]*M[2][2]-M[1][2]*M[2][1]) -
			M[0][1]*(M[1][0]*M[2][2]-M[1][2]*M[2][0]) +
			M[0][2]*(M[1][0]*M[2][1]-M[1][1]*M[2][0])
	}
	d := det(A)
	if d == 0 || !finite(d) {
		return 0, 0, 0, false
	}
	var sol [3]float64
	for k := 0; k < 3; k++ {
		B := A
		for j := 0; j < 3; j++ {
			B[j][k] = r[j]
		}
		sol[k] = det(B) / d
	}
	return sol[0], sol[1], sol[2], finite(sol[0]) && finite(sol[1]) && finite(sol[2])
}
