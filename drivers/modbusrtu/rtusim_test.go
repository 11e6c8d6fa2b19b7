package modbusrtu

import (
	"context"
	"testing"

	"framed/drivers/modbusrtu/rtusim"
	"framed/drivers/serialtest"
)

// Fault shorthands for the driver tests.
const (
	simBadCRC    = rtusim.BadCRC
	simSilent    = rtusim.Silent
	simException = rtusim.Exception
)

// rtuSim is an rtusim slave serving the master end of a pty, which the
// tests can unplug and replug.
type rtuSim struct {
	pty *serialtest.Pty
	*rtusim.Slave
}

func startSim(t *testing.T, slaveID int) *rtuSim {
	sl, err := rtusim.NewSlave(slaveID)
	if err != nil {
		t.Fatal(err)
	}
	s := &rtuSim{pty: serialtest.OpenPty(t), Slave: sl}
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan struct{})
	go func() {
		defer close(done)
		sl.Serve(ctx, func() rtusim.Conn {
			if m := s.pty.Master(); m != nil {
				return m
			}
			return nil
		})
	}()
	t.Cleanup(func() {
		cancel()
		s.pty.Unplug() // unblocks a pending read
		<-done
	})
	return s
}

// setFaults queues faults for the next requests of function fc.
func (s *rtuSim) setFaults(fc byte, f ...rtusim.Fault) { s.QueueFaults(fc, f...) }

// set writes holding (input false) or input registers.
func (s *rtuSim) set(input bool, addr uint16, regs ...uint16) {
	if input {
		s.SetInput(addr, regs...)
	} else {
		s.SetHolding(addr, regs...)
	}
}

func (s *rtuSim) stats() (requests, bad int) { return s.Stats() }
