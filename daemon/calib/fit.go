package calib

import (
	"fmt"
	"math"
	"time"
)

// Fit is a least-squares span fit.
type Fit struct {
	Model     Model
	Degree    int
	Residuals []Residual
	// StdErr is sqrt(SSR / (n - p)) for p parameters; nil when n == p.
	StdErr *float64
}

// FitSpan fits value = Offset + Gain raw (+ Quad raw^2 for degree 2) to the
// references by ordinary least squares. A linear fit needs two distinct
// raw readings, a quadratic three.
//
// The fit works on raw readings centred on their mean and scaled by their
// spread, so ADC counts in the millions do not ruin the normal equations;
// the coefficients are then expanded back to raw units.
func FitSpan(refs []Reference, degree int) (Fit, error) {
	if degree != 1 && degree != 2 {
		return Fit{}, fmt.Errorf("%w: %d (want 1 or 2)", ErrBadDegree, degree)
	}
	p := degree + 1
	n := len(refs)
	if n < p {
		return Fit{}, fmt.Errorf("%w: degree %d needs %d references, got %d", ErrTooFewPoints, degree, p, n)
	}
	var meanX float64
	for i, r := range refs {
		if !finite(r.Reference) || !finite(r.Indicated) {
			return Fit{}, fmt.Errorf("%w: reference %d is %v for reading %v", ErrBadValue, i+1, r.Reference, r.Indicated)
		}
		meanX += r.Indicated
	}
	meanX /= float64(n)
	var scale float64
	for _, r := range refs {
		scale = max(scale, math.Abs(r.Indicated-meanX))
	}
	if scale == 0 {
		return Fit{}, fmt.Errorf("%w: every reference gave the same reading %v", ErrSingular, meanX)
	}
	// Normal equations A c = b in t = (x - meanX) / scale, |t| <= 1.
	var A [3][3]float64
	var b [3]float64
	for _, r := range refs {
		t := (r.Indicated - meanX) / scale
		pow := [3]float64{1, t, t * t}
		for i := 0; i < p; i++ {
			for j := 0; j < p; j++ {
				A[i][j] += pow[i] * pow[j]
			}
			b[i] += pow[i] * r.Reference
		}
	}
	c, err := solve(A, b, p)
	if err != nil {
		return Fit{}, err
	}
	// Expand y = c0 + c1 t + c2 t^2 with t = (x - mx)/s.
	mx, s := meanX, scale
	m := Model{
		Offset: c[0] - c[1]*mx/s + c[2]*mx*mx/(s*s),
		Gain:   c[1]/s - 2*c[2]*mx/(s*s),
		Quad:   c[2] / (s * s),
	}
	if !m.finite() {
		return Fit{}, fmt.Errorf("%w: fit gave %+v", ErrSingular, m)
	}
	f := Fit{Model: m, Degree: degree, Residuals: make([]Residual, n)}
	var ssr float64
	for i, r := range refs {
		// Residuals from the centred form, which is what was minimised.
		t := (r.Indicated - mx) / s
		res := c[0] + t*(c[1]+t*c[2]) - r.Reference
		ssr += res * res
		f.Residuals[i] = Residual{Reference: r.Reference, Residual: res}
		if r.Reference != 0 {
			pct := 100 * res / r.Reference
			f.Residuals[i].Pct = &pct
		}
	}
	if n > p {
		se := math.Sqrt(ssr / float64(n-p))
		f.StdErr = &se
	}
	return f, nil
}

// solve solves the p x p system by Gaussian elimination with partial
// pivoting.
func solve(A [3][3]float64, b [3]float64, p int) ([3]float64, error) {
	var x [3]float64
	var norm float64
	for i := 0; i < p; i++ {
		for j := 0; j < p; j++ {
			norm = max(norm, math.Abs(A[i][j]))
		}
	}
	for col := 0; col < p; col++ {
		piv := col
		for r := col + 1; r < p; r++ {
			if math.Abs(A[r][col]) > math.Abs(A[piv][col]) {
				piv = r
			}
		}
		if math.Abs(A[piv][col]) <= 1e-12*norm {
			return x, fmt.Errorf("%w: the readings do not determine a degree-%d model", ErrSingular, p-1)
		}
		A[col], A[piv] = A[piv], A[col]
		b[col], b[piv] = b[piv], b[col]
		for r := col + 1; r < p; r++ {
			f := A[r][col] / A[col][col]
			for k := col; k < p; k++ {
				A[r][k] -= f * A[col][k]
			}
			b[r] -= f * b[col]
		}
	}
	for i := p - 1; i >= 0; i-- {
		s := b[i]
		for k := i + 1; k < p; k++ {
			s -= A[i][k] * x[k]
		}
		x[i] = s / A[i][i]
	}
	return x, nil
}

// NewSpan fits a span calibration to the references and wraps it as a
// Calibration of channel at time at. unit is "N" or "mm".
func NewSpan(channel, unit string, at time.Time, refs []Reference, degree int) (Calibration, error) {
	f, err := FitSpan(refs, degree)
	if err != nil {
		return Calibration{}, fmt.Errorf("span of %q: %w", channel, err)
	}
	c := Calibration{
		ID: NewID(channel, at), Channel: channel, At: at, Kind: KindSpan, Unit: unit,
		Model: f.Model, Degree: f.Degree, References: append([]Reference(nil), refs...),
		Residuals: f.Residuals, StdErr: f.StdErr,
	}
	return c, c.Validate()
}
