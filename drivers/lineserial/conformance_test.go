package lineserial

import (
	"context"
	"sync"
	"testing"
	"time"

	"framed/drivers"
	"framed/drivers/builtin"
	"framed/drivers/conformance"
	"framed/drivers/serialtest"
)

func TestMain(m *testing.M) {
	conformance.Main(m, map[string]func() drivers.Driver{
		DriverName: func() drivers.Driver { return New() },
	})
}

// board is a simulated bridge board on a pty: 1 kHz key=value lines with
// checksum, sent in 10 ms bursts, until the test ends. It keeps running
// across an unplug (writes fail) and a replug.
type board struct {
	pty *serialtest.Pty
}

func startBoard(t *testing.T) *board {
	b := &board{pty: serialtest.OpenPty(t)}
	stop := make(chan struct{})
	done := make(chan struct{})
	go func() {
		defer close(done)
		fw := &firmware{pty: b.pty, micros: 4294967296 - 30_000}
		tick := time.NewTicker(10 * time.Millisecond)
		defer tick.Stop()
		i := 0
		for {
			select {
			case <-stop:
				return
			case <-tick.C:
			}
			var burst []byte
			for range 10 {
				burst = append(burst, fw.good(i%100000, i)...)
				i++
			}
			b.pty.Write(burst) // fails while unplugged, like a dead cable
		}
	}()
	t.Cleanup(func() { close(stop); <-done })
	return b
}

var (
	latestMu    sync.Mutex
	latestBoard *board
)

func TestConformance(t *testing.T) {
	conformance.Run(t, conformance.Suite{
		Name: DriverName,
		New:  func() drivers.Driver { return New() },
		BadConfigs: map[string][]byte{
			"missing port":   []byte(`{"format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`),
			"bad baud":       []byte(`{"port":"/dev/null","baud":1234,"format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`),
			"unknown key":    []byte(`{"port":"/dev/null","format":"keyvalue","colour":"red","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`),
			"bad checksum":   []byte(`{"port":"/dev/null","format":"keyvalue","checksum":"md5","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`),
			"unknown field":  []byte(`{"port":"/dev/null","format":"delimited","fields":["a"],"channels":[{"name":"f","field":"b","quantity":"force","unit":"counts"}]}`),
			"bad stop bits":  []byte(`{"port":"/dev/null","stop_bits":4,"format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`),
			"bad parity":     []byte(`{"port":"/dev/null","parity":"space","format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`),
			"no channels":    []byte(`{"port":"/dev/null","format":"keyvalue"}`),
			"negative batch": []byte(`{"port":"/dev/null","format":"keyvalue","batch_ms":-5,"channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`),
		},
		Setup: func(t *testing.T) []byte {
			b := startBoard(t)
			latestMu.Lock()
			latestBoard = b
			latestMu.Unlock()
			return ptyConfig(b.pty.Path())
		},
		MinSamples: 50,
		InjectFault: func(t *testing.T) {
			latestMu.Lock()
			b := latestBoard
			latestMu.Unlock()
			// Pull the cable for 100 ms: the driver sees the hang-up at
			// once and retries opening until the link is back.
			b.pty.Unplug()
			time.Sleep(100 * time.Millisecond)
			b.pty.Replug()
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
