package reduce

import (
	"fmt"
	"math"
)

// Options tune a reduction. The zero value gives the defaults documented on
// each field, so callers set only what they know about their frame.
type Options struct {
	// ProofPct are the plastic extensions for Rp, in % (default 0.2 and 1).
	ProofPct []float64
	// TotalPct are the total extensions for Rt, in % (default 0.5).
	TotalPct []float64
	// HardeningFromPct and HardeningToPct bound the engineering strain range
	// for n and K, in % (default 10 to 20, cut at Ag; when the range lies
	// beyond Ag it falls back to from the end of yielding to Ag).
	HardeningFromPct, HardeningToPct float64

	// ForceClassPct is the force channel's ISO 7500-1 class (default 1):
	// a relative bias bound of that many %, taken as rectangular.
	ForceClassPct float64
	// ExtensometerClassPct is the extensometer's ISO 9513 class (default 1):
	// bias bound of that % of reading or 3 um x class, whichever is larger.
	ExtensometerClassPct float64
	// ForceRelUPct and ExtensometerRelUPct, when set, are the relative
	// standard uncertainties (%) of the channels from their calibration
	// certificates; they replace the class-based estimates.
	ForceRelUPct, ExtensometerRelUPct float64
	// DimensionUMM is the standard uncertainty of each measured dimension
	// in mm (default 0.005 mm, a micrometer read to 0.01 mm).
	DimensionUMM float64
	// LengthUMM is the standard uncertainty of L0 and Lu in mm (default
	// 0.1 mm, common practice for fitted-together pieces).
	LengthUMM float64

	// ComplianceMMPerN is the load train's compliance from a stored machine
	// calibration, subtracted from crosshead readings (extension minus
	// compliance x force). Zero means none is known.
	ComplianceMMPerN float64

	// MinElasticPoints is the fewest points accepted for E without the
	// few-elastic-points flag (default 20).
	MinElasticPoints int
	// MinR2 and MaxV1Pct are the fit-quality limits of the elastic fit
	// (defaults 0.999 and 1 %); outside them E is flagged poor-elastic-fit.
	MinR2, MaxV1Pct float64
}

func (o Options) withDefaults() (Options, error) {
	if o.ProofPct == nil {
		o.ProofPct = []float64{0.2, 1}
	}
	if o.TotalPct == nil {
		o.TotalPct = []float64{0.5}
	}
	for _, p := range append(append([]float64(nil), o.ProofPct...), o.TotalPct...) {
		if !(p > 0) || math.IsInf(p, 0) {
			return o, fmt.Errorf("%w: extension %v %% must be positive", ErrBadOptions, p)
		}
	}
	if o.HardeningFromPct == 0 && o.HardeningToPct == 0 {
		o.HardeningFromPct, o.HardeningToPct = 10, 20
	}
	if !(o.HardeningFromPct >= 0) || !(o.HardeningToPct > o.HardeningFromPct) {
		return o, fmt.Errorf("%w: hardening range %v-%v %%", ErrBadOptions, o.HardeningFromPct, o.HardeningToPct)
	}
	def := func(v *float64, d float64, name string) error {
		if *v == 0 {
			*v = d
		}
		if !(*v > 0) || math.IsInf(*v, 0) {
			return fmt.Errorf("%w: %s %v", ErrBadOptions, name, *v)
		}
		return nil
	}
	for _, e := range []error{
		def(&o.ForceClassPct, 1, "force class"),
		def(&o.ExtensometerClassPct, 1, "extensometer class"),
		def(&o.DimensionUMM, 0.005, "dimension uncertainty"),
		def(&o.LengthUMM, 0.1, "length uncertainty"),
		def(&o.MinR2, 0.999, "minimum r2"),
		def(&o.MaxV1Pct, 1, "maximum V1"),
	} {
		if e != nil {
			return o, e
		}
	}
	if o.MinElasticPoints == 0 {
		o.MinElasticPoints = 20
	}
	if o.ForceRelUPct < 0 || o.ExtensometerRelUPct < 0 || math.IsNaN(o.ForceRelUPct+o.ExtensometerRelUPct) || math.IsInf(o.ForceRelUPct+o.ExtensometerRelUPct, 0) {
		return o, fmt.Errorf("%w: channel uncertainty %v / %v %%", ErrBadOptions, o.ForceRelUPct, o.ExtensometerRelUPct)
	}
	if o.ComplianceMMPerN < 0 || math.IsNaN(o.ComplianceMMPerN) || math.IsInf(o.ComplianceMMPerN, 0) {
		return o, fmt.Errorf("%w: compliance %v mm/N", ErrBadOptions, o.ComplianceMMPerN)
	}
	return o, nil
}
