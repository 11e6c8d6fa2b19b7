package detect

import "framed/reduce"

// Detected is everything found in the current test so far, as copies the
// caller may keep: events, holds (an open hold ends at its latest settled
// reading, with its rates so far), unloads, the elastic-limit bracket and
// flags. Forces are readings on the channel's own scale (see the
// force-not-tared flag), sets are relative to the reading at rest before
// the start.
func (d *Detector) Detected() reduce.Detected {
	out := reduce.Detected{
		Events:  append([]reduce.Event(nil), d.events...),
		Holds:   append([]reduce.Hold(nil), d.holds...),
		Unloads: make([]reduce.Unload, 0, len(d.unloads)),
		Flags:   append([]string(nil), d.flags...),
	}
	for _, u := range d.unloads {
		out.Unloads = append(out.Unloads, u.u)
	}
	if d.state == Running && d.run.holdIdx >= 0 {
		d.finishHold(&out.Holds[d.run.holdIdx], d.run.lastInS)
	}
	if d.state != Idle {
		out.ElasticLimit = d.elasticLimit()
	}
	return out
}
