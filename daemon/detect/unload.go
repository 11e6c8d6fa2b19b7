package detect

import (
	"math"

	"framed/reduce"
)

// unloadRec is an unload with whether its set could be measured.
type unloadRec struct {
	u        reduce.Unload
	setKnown bool
}

// unload records a settled return to no load (or the hanger's load). The
// load it came from is the highest hold settled since the last unload (the
// weights that hung), else the highest force seen. The set is measured on
// the extension, else on the crosshead, from the reading at rest before
// the start.
func (d *Detector) unload(levelN, extMM, xhMM, t, rawT float64) {
	r := &d.run
	after := r.cyclePeakN
	if r.cycleHasHld {
		after = r.cycleHoldN
	}
	rec := unloadRec{u: reduce.Unload{TimeS: t, AfterForceN: after}}
	switch {
	case finite(extMM) && finite(r.extRef):
		rec.u.SetMM, rec.setKnown = extMM-r.extRef, true
	case finite(xhMM) && finite(r.xhRef):
		rec.u.SetMM, rec.setKnown = xhMM-r.xhRef, true
	default:
		d.flag(FlagSetUnknown)
	}
	d.unloads = append(d.unloads, rec)
	e := d.emit(reduce.Event{Kind: reduce.EventUnload, TimeS: t, ForceN: fptr(levelN)}, rawT)
	uc := rec.u
	e.Unload = &uc
}

// elasticLimit brackets the elastic limit between the highest load whose
// unload left no set and the first load whose unload did (set appears only
// past the elastic limit: common practice).
func (d *Detector) elasticLimit() *reduce.ElasticLimit {
	var el reduce.ElasticLimit
	noSet := math.Inf(-1)
	for _, u := range d.unloads {
		if !u.setKnown {
			continue
		}
		if u.u.SetMM > d.run.setThrMM {
			el.SetFromN = fptr(u.u.AfterForceN)
			break
		}
		noSet = math.Max(noSet, u.u.AfterForceN)
	}
	if !math.IsInf(noSet, -1) {
		el.NoSetUpToN = fptr(noSet)
	}
	if el.NoSetUpToN == nil && el.SetFromN == nil {
		return nil
	}
	return &el
}
