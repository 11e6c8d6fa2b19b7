package daemon

import (
	"bytes"
	"encoding/json"
	"fmt"
	"time"

	"framed/reduce"
)

// control answers one control request. Every op is read-only except
// specimen (queue metadata), tare and calibrate (store a calibration).
func (d *Daemon) control(req Request) (any, error) {
	switch req.Op {
	case "status":
		return d.status(), nil
	case "tests":
		return d.db.Tests()
	case "result":
		doc, _, err := d.db.Result(req.TestID)
		if err != nil {
			return nil, err
		}
		return json.RawMessage(doc), nil
	case "samples":
		c, err := d.db.ReadSamples(req.TestID)
		if err != nil {
			return nil, err
		}
		return curveJSON(c), nil
	case "specimen":
		var sp reduce.Specimen
		dec := json.NewDecoder(bytes.NewReader(req.Specimen))
		dec.DisallowUnknownFields()
		if err := dec.Decode(&sp); err != nil {
			return nil, fmt.Errorf("specimen: %w", err)
		}
		return map[string]int{"queued": len(d.spec.list()) + 1}, d.spec.push(sp)
	case "read":
		n := req.Samples
		if n <= 0 {
			n = 200
		}
		mean, sd, used := d.recent.stats(n)
		if used == 0 {
			return nil, fmt.Errorf("no force readings yet")
		}
		return map[string]any{"raw_mean": mean, "raw_sd": sd, "samples": used, "calibrated_mean": d.loadCalibrations().force(mean)}, nil
	case "tare":
		return d.tare(req)
	case "calibrate":
		return d.storeCalibration(req.Calibration)
	case "verification":
		return d.storeVerification(req.Calibration)
	case "calibrations":
		return d.cal.List(req.Channel)
	}
	return nil, fmt.Errorf("unknown op %q", req.Op)
}

func (d *Daemon) status() map[string]any {
	d.mu.Lock()
	st := map[string]any{
		"frame": d.cfg.Frame, "state": d.state, "test_id": d.testID,
		"broker": d.brokerURL, "uptime_s": time.Since(d.started).Seconds(),
	}
	if d.lastErr != "" {
		st["last_error"] = d.lastErr
	}
	d.mu.Unlock()
	var drv []map[string]any
	for _, s := range d.sups {
		drv = append(drv, s.status())
	}
	st["drivers"] = drv
	if n, err := d.db.OutboxLen(); err == nil {
		st["outbox"] = n
	}
	st["queued_specimens"] = len(d.spec.list())
	st["readings"] = d.recent.count()
	return st
}

// curveJSON is a stored test's samples in columns, NaN as null.
func curveJSON(c reduce.Curve) map[string]any {
	col := func(v []float64) []*float64 {
		if v == nil {
			return nil
		}
		out := make([]*float64, len(v))
		for i := range v {
			out[i] = finite(v[i])
		}
		return out
	}
	return map[string]any{"time_s": c.TimeS, "force_N": col(c.ForceN), "extension_mm": col(c.ExtensionMM), "crosshead_mm": col(c.CrossheadMM)}
}
