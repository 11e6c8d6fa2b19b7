package daemon

import (
	"encoding/json"
	"fmt"
	"math"
	"time"

	"framed/daemon/calib"
	"framed/reduce"
)

// calSet is the calibration model in force for each frame signal. The
// acquisition loop reloads it every few seconds, so a tare or span stored
// through the control socket applies to the next batches.
type calSet struct {
	models [nSignals]calib.Model
	has    [nSignals]bool
}

func (c calSet) apply(out *reduce.Curve) {
	cols := [nSignals][]float64{out.ForceN, out.ExtensionMM, out.CrossheadMM}
	for s := range nSignals {
		if c.has[s] && cols[s] != nil {
			c.models[s].ApplyColumn(cols[s])
		}
	}
}

// force converts a raw force reading.
func (c calSet) force(raw float64) float64 {
	if !c.has[sigForce] {
		return raw
	}
	return c.models[sigForce].Apply(raw)
}

func (d *Daemon) loadCalibrations() calSet {
	var cs calSet
	for s := range nSignals {
		c, ok, err := d.cal.Current(signalNames[s])
		if err != nil {
			d.log.Error("read calibration", "channel", signalNames[s], "err", err)
			continue
		}
		if ok {
			cs.models[s], cs.has[s] = c.Model, true
		}
	}
	return cs
}

// calibrationRefs names, for the result document, the calibration behind
// each signal, and flags channels in raw counts with no calibration and
// calibrations older than the configured age.
func (d *Daemon) calibrationRefs() ([]reduce.CalibrationRef, []string) {
	var refs []reduce.CalibrationRef
	var flags []string
	maxAge := time.Duration(d.cfg.CalibrationMaxAgeDays * 24 * float64(time.Hour))
	for s := range nSignals {
		src := d.srcs[s]
		if src.driver < 0 {
			continue
		}
		unit := d.infos[src.driver].Channels[src.channel].Unit
		flag, c, err := d.cal.Flag(signalNames[s], time.Now(), maxAge)
		if err != nil {
			d.log.Error("read calibration", "channel", signalNames[s], "err", err)
			continue
		}
		switch {
		case flag == calib.FlagMissing && unit != "counts":
			refs = append(refs, reduce.CalibrationRef{Channel: signalNames[s], ID: "device-units"})
		case flag == calib.FlagMissing:
			flags = append(flags, signalNames[s]+"-"+calib.FlagMissing)
		default:
			refs = append(refs, reduce.CalibrationRef{Channel: signalNames[s], ID: c.ID, At: c.At.UTC().Format(time.RFC3339)})
			if flag != "" {
				flags = append(flags, signalNames[s]+"-"+flag)
			}
		}
	}
	return refs, flags
}

// tare re-zeroes a signal (default force) from its latest quiet readings.
func (d *Daemon) tare(req Request) (any, error) {
	ch := req.Channel
	if ch == "" {
		ch = "force"
	}
	if ch != "force" {
		return nil, fmt.Errorf("tare of %q: only the force channel keeps recent readings", ch)
	}
	n := req.Samples
	if n <= 0 {
		n = 500
	}
	raw := d.recent.last(n)
	w, err := calib.Quiet(raw, quietLimit(raw))
	if err != nil {
		return nil, fmt.Errorf("tare refused, the reading was not steady (wait for the frame to be still and unloaded, then try again): %w", err)
	}
	// A tare keeps the span in force and only moves its zero.
	var c calib.Calibration
	if cur, ok, err := d.cal.Current(ch); err != nil {
		return nil, err
	} else if ok {
		c, err = calib.TareOn(cur, time.Now().UTC(), w)
		if err != nil {
			return nil, err
		}
	} else if c, err = calib.NewTare(ch, time.Now().UTC(), calib.Identity, w); err != nil {
		return nil, err
	}
	if err := d.cal.Save(c); err != nil {
		return nil, err
	}
	d.calibrationChanged()
	d.log.Info("tared", "channel", ch, "id", c.ID, "mean_raw", w.MeanRaw, "sd_raw", w.SDRaw)
	return c, nil
}

// storeCalibration stores a span calibration computed by framectl from
// reference weights read through this socket.
func (d *Daemon) storeCalibration(raw json.RawMessage) (any, error) {
	var c calib.Calibration
	if err := json.Unmarshal(raw, &c); err != nil {
		return nil, fmt.Errorf("calibration: %w", err)
	}
	if err := c.Validate(); err != nil {
		return nil, err
	}
	if err := d.cal.Save(c); err != nil {
		return nil, err
	}
	d.calibrationChanged()
	d.log.Info("calibration stored", "channel", c.Channel, "id", c.ID, "kind", c.Kind)
	return c, nil
}

// reduceOptions are the reduction options from the configuration.
func (d *Daemon) reduceOptions() reduce.Options {
	o := reduce.Options{ComplianceMMPerN: d.cfg.ComplianceMMPerN}
	if v := classPct(d.cfg.ForceClass); v > 0 {
		o.ForceClassPct = v
	}
	if v := classPct(d.cfg.ExtensometerClass); v > 0 {
		o.ExtensometerClassPct = v
	}
	return o
}

func classPct(s string) float64 {
	var v float64
	if _, err := fmt.Sscan(s, &v); err != nil {
		return 0
	}
	return v
}

func (d *Daemon) calibrationChanged() {
	select {
	case d.calChanged <- struct{}{}:
	default:
	}
}

// quietLimit is the largest spread a tare window may have: six times the
// reading's own noise, estimated from sample-to-sample differences (sd of
// differences / sqrt 2), which a load change or drift barely moves while
// it swells the spread about the mean. Six allows for boards that filter
// their readings (correlated noise has smaller differences).
func quietLimit(raw []float64) float64 {
	var sum2 float64
	n := 0
	for i := 1; i < len(raw); i++ {
		d := raw[i] - raw[i-1]
		if d != d { // NaN: no reading
			continue
		}
		sum2 += d * d
		n++
	}
	if n < 2 {
		return 0 // too few to judge; calib.Quiet refuses fewer than 2 anyway
	}
	noise := math.Sqrt(sum2/float64(n)) / math.Sqrt2
	if noise == 0 {
		return 0 // a perfectly steady reading: nothing to limit
	}
	return 6 * noise
}
