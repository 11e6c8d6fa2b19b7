package boardsim

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat"
)

func TestCellNonlinearityIsPercentOfReading(t *testing.T) {
	c := LoadCell{OffsetCounts: 1000, CountsPerN: 200, NonlinearityPct: 0.4, FullScaleN: 2000}
	// By the definition in LoadCell's doc: at full scale the reading above
	// the offset departs from the straight line CountsPerN F by
	// NonlinearityPct of that line's value; at half scale by half as much.
	for _, tc := range []struct{ f, wantPct float64 }{{2000, 0.4}, {1000, 0.2}, {500, 0.1}} {
		line := c.CountsPerN * tc.f
		got := 100 * (c.Ideal(tc.f) - c.OffsetCounts - line) / line
		if math.Abs(got-tc.wantPct) > 1e-12 {
			t.Errorf("deviation at %v N = %.6f %%, want %.6f %%", tc.f, got, tc.wantPct)
		}
	}
	if got := c.Ideal(0); got != c.OffsetCounts {
		t.Errorf("Ideal(0) = %v, want the offset %v", got, c.OffsetCounts)
	}
}

func TestCellClipsToSigned24Bit(t *testing.T) {
	c := LoadCell{CountsPerN: 1e6, FullScaleN: 1}
	// A 24-bit two's-complement ADC reads -8388608..8388607 (2^23 = 8388608).
	if got := c.Counts(100, nil); got != 8388607 {
		t.Errorf("over range: %d, want 8388607", got)
	}
	if got := c.Counts(-100, nil); got != -8388608 {
		t.Errorf("under range: %d, want -8388608", got)
	}
	if got := c.Counts(math.NaN(), nil); got != -8388608 {
		t.Errorf("NaN force: %d, want the bottom rail", got)
	}
}

func TestCellNoiseHasConfiguredSD(t *testing.T) {
	c := LoadCell{OffsetCounts: 5000, CountsPerN: 1, FullScaleN: 1, NoiseCounts: 40}
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 20000)
	for i := range x {
		x[i] = float64(c.Counts(0, rng))
	}
	// The sample sd of n normal draws has a relative standard error of
	// about 1/sqrt(2n) = 0.5 % here; allow 3 %. Rounding to whole counts
	// adds a variance of 1/12 count^2 (common practice), negligible at 40.
	mean, sd := stat.MeanStdDev(x, nil)
	if math.Abs(sd-40)/40 > 0.03 || math.Abs(mean-5000) > 2 {
		t.Errorf("noise mean %.2f sd %.2f, want 5000 and 40", mean, sd)
	}
}

func TestCellValidate(t *testing.T) {
	if err := DefaultCell.Validate(); err != nil {
		t.Errorf("DefaultCell: %v", err)
	}
	// The default cell's full scale must stay inside the 24-bit range.
	if top := DefaultCell.Ideal(DefaultCell.FullScaleN) + 6*DefaultCell.NoiseCounts; top > MaxCounts24 {
		t.Errorf("DefaultCell reads %.0f counts at full scale, over the 24-bit limit", top)
	}
	bad := []LoadCell{
		{CountsPerN: 0, FullScaleN: 1},
		{CountsPerN: 1, FullScaleN: 0},
		{CountsPerN: 1, FullScaleN: 1, NoiseCounts: -1},
		{CountsPerN: math.NaN(), FullScaleN: 1},
		{CountsPerN: 1, FullScaleN: 1, NonlinearityPct: 80},
	}
	for _, c := range bad {
		if err := c.Validate(); !errors.Is(err, ErrBadCell) {
			t.Errorf("%+v: %v, want ErrBadCell", c, err)
		}
	}
}
