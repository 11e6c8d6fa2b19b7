package modbusrtu

import (
	"context"
	"sync"
	"testing"
	"time"

	"framed/drivers"
	"framed/drivers/builtin"
	"framed/drivers/conformance"
)

func TestMain(m *testing.M) {
	conformance.Main(m, map[string]func() drivers.Driver{
		DriverName: func() drivers.Driver { return New() },
	})
}

var (
	latestMu  sync.Mutex
	latestSim *rtuSim
)

func TestConformance(t *testing.T) {
	conformance.Run(t, conformance.Suite{
		Name: DriverName,
		New:  func() drivers.Driver { return New() },
		BadConfigs: map[string][]byte{
			"missing port":  []byte(`{"slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"}]}`),
			"bad baud":      []byte(`{"port":"/dev/null","baud":7,"slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"}]}`),
			"bad slave id":  []byte(`{"port":"/dev/null","slave_id":300,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"}]}`),
			"unknown key":   []byte(`{"port":"/dev/null","slave_id":1,"speed":9600,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"}]}`),
			"bad type":      []byte(`{"port":"/dev/null","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"double"}]}`),
			"span over 125": []byte(`{"port":"/dev/null","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"},{"name":"g","quantity":"other","unit":"counts","address":200,"type":"int16"}]}`),
		},
		Setup: func(t *testing.T) []byte {
			sim := startSim(t, 7)
			loadSim(sim)
			latestMu.Lock()
			latestSim = sim
			latestMu.Unlock()
			return simConfig(sim.pty.Path(), 7)
		},
		MinSamples: 10,
		InjectFault: func(t *testing.T) {
			latestMu.Lock()
			sim := latestSim
			latestMu.Unlock()
			// Unplug the adapter for 100 ms.
			sim.pty.Unplug()
			time.Sleep(100 * time.Millisecond)
			sim.pty.Replug()
		},
		Fault:   conformance.FaultReopens,
		Timeout: 5 * time.Second,
	})
}

func TestRegisteredAsBuiltin(t *testing.T) {
	f, ok := builtin.Lookup(DriverName)
	if !ok {
		t.Fatalf("%q not registered", DriverName)
	}
	if info, _ := f().Describe(context.Background()); info.Driver != DriverName {
		t.Errorf("registered factory describes %q", info.Driver)
	}
}
