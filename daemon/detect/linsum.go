package detect

import "math"

// linsum accumulates the sums of a least-squares line v(t), about a
// reference point (t0, v0) taken from the first sample so that the sums
// stay small and the variance does not drown in rounding.
type linsum struct {
	n, su, sv, suu, svv, suv float64
	t0, v0                   float64
}

func (l *linsum) reset() { *l = linsum{} }

func (l *linsum) add(t, v float64) {
	if l.n == 0 {
		l.t0, l.v0 = t, v
	}
	u, w := t-l.t0, v-l.v0
	l.n++
	l.su += u
	l.sv += w
	l.suu += u * u
	l.svv += w * w
	l.suv += u * w
}

// merge adds o's samples to l, moving o's sums to l's reference point.
func (l *linsum) merge(o *linsum) {
	if o.n == 0 {
		return
	}
	if l.n == 0 {
		*l = *o
		return
	}
	dt, dv := o.t0-l.t0, o.v0-l.v0
	n := o.n
	l.suu += o.suu + 2*dt*o.su + n*dt*dt
	l.svv += o.svv + 2*dv*o.sv + n*dv*dv
	l.suv += o.suv + dt*o.sv + dv*o.su + n*dt*dv
	l.su += o.su + n*dt
	l.sv += o.sv + n*dv
	l.n += n
}

func (l *linsum) mean() float64 {
	if l.n == 0 {
		return math.NaN()
	}
	return l.v0 + l.sv/l.n
}

// slope is dv/dt of the fitted line; 0 when time does not vary.
func (l *linsum) slope() float64 {
	d := l.n*l.suu - l.su*l.su
	if l.n < 2 || d <= 0 {
		return 0
	}
	return (l.n*l.suv - l.su*l.sv) / d
}

// residStd is the standard deviation of the samples about the fitted line.
func (l *linsum) residStd() float64 {
	if l.n < 3 {
		return math.Inf(1)
	}
	svv := l.svv - l.sv*l.sv/l.n
	suv := l.suv - l.su*l.sv/l.n
	r := svv - l.slope()*suv
	if r < 0 {
		r = 0
	}
	return math.Sqrt(r / (l.n - 2))
}

// std is the standard deviation of the samples about their mean.
func (l *linsum) std() float64 {
	if l.n < 2 {
		return math.Inf(1)
	}
	v := (l.svv - l.sv*l.sv/l.n) / (l.n - 1)
	if v < 0 {
		v = 0
	}
	return math.Sqrt(v)
}
