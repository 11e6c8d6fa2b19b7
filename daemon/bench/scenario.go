package bench

import (
	"encoding/json"
	"fmt"
	"strings"

	"framed/daemon"
	"framed/drivers/sim"
)

// benchFrame is the frame name of the daemon under measurement.
const benchFrame = "bench"

// rawBytesPerSample is a raw sample as it leaves the acquisition loop:
// time, force, extension and crosshead as float64. Write amplification is
// counted against it.
const rawBytesPerSample = 32

// specimen returns a demo specimen by the end of its id, with its
// crosshead rate changed: slow for one long test, fast for many short
// ones.
func specimen(idSuffix string, crossheadMMPerMin float64) (sim.Specimen, error) {
	for _, sp := range sim.DemoScript() {
		if strings.HasSuffix(sp.ID, idSuffix) {
			sp.Loading.CrossheadMMPerMin = crossheadMMPerMin
			return sp, nil
		}
	}
	return sim.Specimen{}, fmt.Errorf("%w: the demo series has no specimen %q", ErrBadOptions, idSuffix)
}

// longSpecimen is the 1018-like steel as a 5 mm bar at 0.2 mm/min: one
// test of about 45 minutes at speed 1, longer than any measurement window,
// so the daemon records one long test throughout. Its Fm of about 8.6 kN
// suits a 10 kN load cell (longForceRangeN), on which the test starts
// (1 % of the range) a second or two into the loading.
func longSpecimen() (sim.Specimen, error) {
	sp, err := specimen("ST03", 0.2)
	sp.D0MM = 5
	return sp, err
}

// longForceRangeN is the load cell of the long test.
const longForceRangeN = 10000

// longSettings runs the long test at rateHz after pauseS of idle.
func longSettings(rateHz float64, pace string, pauseS float64) (simSettings, error) {
	sp, err := longSpecimen()
	return simSettings{rateHz: rateHz, speed: 1, pauseS: pauseS, pace: pace, forceRangeN: longForceRangeN, specs: []sim.Specimen{sp}}, err
}

// shortSpecimen is the 6061-like aluminium bar at 600 mm/min: a loading
// of a few tenths of a second, for many breaks in a short run. Its neck
// drop is cut from 20 % to 2 %: squeezed into so short a test, a 20 %
// drop falls several percent within the detector's 50 ms break window,
// and the detector rightly dates the break at the last reading near the
// window's top, up to 50 ms before the fall, which would count as latency.
// At real test speeds the force near fracture changes little in 50 ms,
// as it does here with the smaller drop.
func shortSpecimen() (sim.Specimen, error) {
	sp, err := specimen("AL01", 600)
	sp.Material.NeckDrop = 0.02
	return sp, err
}

type simSettings struct {
	rateHz, speed, pauseS float64
	forceRangeN           float64 // 0: the sim's default load cell
	batchMS               float64 // 0: the sim's default, 25 ms
	pace                  string
	loop                  bool
	specs                 []sim.Specimen
}

func (s simSettings) config() json.RawMessage {
	m := map[string]any{
		"seed": 7, "rate_hz": s.rateHz, "speed": s.speed, "pace": s.pace,
		"pause_s": s.pauseS, "loop": s.loop, "specimens": s.specs,
	}
	if s.batchMS > 0 {
		m["batch_ms"] = s.batchMS
	}
	if s.forceRangeN > 0 {
		m["sensors"] = map[string]any{"force_range_N": s.forceRangeN}
	}
	raw, _ := json.Marshal(m)
	return raw
}

// daemonConfig is framed with the sim as its only driver and the first
// specimen's geometry as the default specimen, everything else default
// (commit interval 100 ms, live readings 5 Hz).
func daemonConfig(s simSettings, broker string) daemon.Config {
	geo := s.specs[0].Geometry()
	return daemon.Config{
		Frame:    benchFrame,
		Broker:   broker,
		Drivers:  []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: s.config()}},
		Specimen: &geo,
	}
}
