package reduce

// Reduce computes the result document of one recorded test: the
// quantities of ISO 6892-1 / ASTM E8 / E111 / E646 that the data supports,
// each with its method and expanded uncertainty (k=2), and flags for what
// it cannot support. It copies the detector's events, holds, unloads and
// elastic limit, and adds a break event when the detector found none.
// TestID, Frame, Revision and StartedAt are the caller's to fill.
//
// It never panics on odd input: unusable input returns one of the named
// errors in errors.go.
func Reduce(c Curve, sp Specimen, det Detected, opt Options) (Result, error) {
	opt, err := opt.withDefaults()
	if err != nil {
		return Result{}, err
	}
	w, err := newWork(c, sp, opt)
	if err != nil {
		return Result{}, err
	}
	for _, f := range det.Flags {
		w.flag(f)
	}
	w.findBreak(det)
	w.buildStrain()
	w.noiseMPa = w.stressNoiseMPa()
	if w.hasLoadCycles() {
		w.flag(FlagLoadCycles)
		w.flag(FlagNoElasticFit)
	} else {
		w.fitElastic()
	}
	res := Result{
		Schema:       SchemaVersion,
		Specimen:     SpecimenInfo{Specimen: sp, UsedS0MM2: w.s0MM2},
		Events:       append([]Event{}, det.Events...),
		Holds:        append([]Hold{}, det.Holds...),
		Unloads:      append([]Unload{}, det.Unloads...),
		ElasticLimit: det.ElasticLimit,
	}
	if !hasBreak(det.Events) {
		res.Events = append(res.Events, w.breakEvent())
	}
	res.Quantities = w.quantities()
	res.Flags = append([]string{}, w.flags...)
	if w.fitOK {
		res.Fit = &ElasticFit{
			FromMPa:  w.fitFromMPa,
			ToMPa:    w.fitToMPa,
			Points:   w.fit.points,
			R2:       w.fit.r2,
			V1Pct:    w.fit.v1Pct,
			Apparent: w.source == fromCrosshead,
		}
	}
	return res, nil
}

func hasBreak(ev []Event) bool {
	for _, e := range ev {
		if e.Kind == EventBreak {
			return true
		}
	}
	return false
}
