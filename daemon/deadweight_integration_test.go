package daemon_test

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"framed/daemon"
	"framed/daemon/publish/brokertest"
	"framed/drivers/sim"
)

// The demo's dead-weight wire, run exactly as `framed --demo` runs it:
// the published result shows each settled hold, each unload with its
// permanent set, and the elastic limit bracketed between the heaviest
// weight that left no set and the first that did. Facts of the trade as
// check values (common practice): a hanging load must settle before it is
// read, set appears only past the elastic limit, and under the last
// weights the wire creeps.
func TestDemoDeadWeightResultIntegration(t *testing.T) {
	var wire []sim.Specimen
	for _, sp := range sim.DemoScript() {
		if sp.Loading.Mode == sim.ModeDeadWeight {
			wire = append(wire, sp)
		}
	}
	if len(wire) != 1 {
		t.Fatalf("demo script has %d dead-weight specimens, want 1", len(wire))
	}
	addr := fmt.Sprintf("127.0.0.1:%d", brokertest.FreePort(t))
	simCfg := []byte(fmt.Sprintf(`{"seed":1,"rate_hz":200,"speed":%d,"pace":"realtime","pause_s":1,"loop":false,"specimens":%s}`, sim.DemoSpeed, mustJSON(t, wire)))
	cfg := daemon.Config{
		Frame: "e2e", StateDir: t.TempDir(), Broker: "embedded:" + addr,
		Drivers: []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: simCfg}},
		// as the demo sets them
		Detect: daemon.DetectConfig{StartFraction: 0.0001, HangerN: sim.DemoHangerKG * sim.StandardGravity},
	}
	next, restart := specimenOrder(wire, false)
	runDaemon(t, cfg, daemon.Options{SpecimenFallback: next, OnDriverRestart: restart})
	results := subscribe(t, "tcp://"+addr)
	select {
	case r := <-results:
		t.Logf("holds %+v", r.Holds)
		t.Logf("unloads %+v", r.Unloads)
		t.Logf("elastic limit %+v, flags %v", r.ElasticLimit, r.Flags)
		var kinds []string
		for _, e := range r.Events {
			kinds = append(kinds, e.Kind)
		}
		t.Logf("events %v", kinds)
		if len(r.Holds) < 4 {
			t.Errorf("%d settled holds, want one per weight step held (at least 4)", len(r.Holds))
		}
		if len(r.Unloads) < 2 {
			t.Errorf("%d unloads, want the returns to the hanger (at least 2)", len(r.Unloads))
		}
		el := r.ElasticLimit
		if el == nil || el.NoSetUpToN == nil || el.SetFromN == nil || *el.NoSetUpToN >= *el.SetFromN {
			t.Errorf("elastic limit %+v: want a bracket no-set < set", el)
		}
		if !strings.Contains(strings.Join(kinds, ","), "break") {
			t.Errorf("no break on the last weight: events %v", kinds)
		}
		creeping := 0
		for _, h := range r.Holds {
			if h.CreepMMPerS > 0 {
				creeping++
			}
		}
		if creeping == 0 {
			t.Errorf("no hold shows creep, yet the heaviest weights are past the elastic limit")
		}
	case <-time.After(150 * time.Second):
		t.Fatal("no result for the dead-weight test within 150 s")
	}
}
