package main

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"sync"

	"framed/daemon"
	"framed/drivers/sim"
	"framed/reduce"
)

// demoFrame is the demo's frame id: the goods-in bench of the invented
// workshop the simulated specimens come from.
const demoFrame = "goodsin-1"

// demoSetup makes the configuration of `framed --demo`: the simulated
// frame running its scripted series in a loop. The specimens' metadata is
// handed out in the script's order, the way a lab system would queue it
// on framed/<frame>/specimens; when the sim restarts, so does the order.
// A configuration file given with --demo keeps its settings (broker,
// frame, store) and gets the sim as its driver.
func demoSetup(cfg daemon.Config, fromFile bool) (daemon.Config, daemon.Options, error) {
	if !fromFile {
		cfg.Frame = demoFrame
	}
	cfg.Drivers = []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: json.RawMessage(sim.SampleConfig)}}
	cfg.Channels = daemon.ChannelMap{}
	// The demo frame's 100 kN load cell also carries the wire's dead
	// weights of a few kg: start a test at 0.01 % of its range (10 N, about
	// twenty noise floors) rather than the default 1 %.
	if cfg.Detect.StartFraction == 0 {
		cfg.Detect.StartFraction = 0.0001
	}
	// The wire's empty hanger is hung after the tare: its unloads return
	// to the hanger's weight, and sets are measured from there.
	if cfg.Detect.HangerN == 0 {
		cfg.Detect.HangerN = sim.DemoHangerKG * sim.StandardGravity
	}
	script := sim.DemoScript()
	var mu sync.Mutex
	next := 0
	opt := daemon.Options{
		SpecimenFallback: func() (reduce.Specimen, bool) {
			mu.Lock()
			defer mu.Unlock()
			sp := script[next%len(script)].Geometry()
			if round := next/len(script) + 1; round > 1 {
				// Each round of the demo tests new pieces of the same stock.
				sp.ID = fmt.Sprintf("%s-r%d", sp.ID, round)
			}
			next++
			return sp, true
		},
		OnDriverRestart: func(string) {
			mu.Lock()
			next = 0
			mu.Unlock()
		},
	}
	return cfg, opt, nil
}

func demoBanner(w io.Writer, cfg daemon.Config, d *daemon.Daemon) {
	broker := cfg.Broker
	if strings.HasPrefix(broker, "embedded") {
		_, addr, _ := daemon.ParseBroker(broker)
		broker = "tcp://" + addr
	}
	fmt.Fprintf(w, `
framed demo: a simulated frame at %s
runs its specimens over and over; each result is published on
  %s/%s/results/<test-id>  (broker %s)
Watch them arrive in another terminal:
  go run ./cmd/framectl watch --broker %s --frame %s
Stop with Ctrl-C. Nothing here controls a real frame.

`, sim.DemoScenario, cfg.MQTT.Root, cfg.Frame, broker, broker, cfg.Frame)
}
