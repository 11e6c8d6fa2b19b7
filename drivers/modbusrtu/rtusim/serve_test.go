package rtusim_test

import (
	"context"
	"io"
	"log"
	"testing"
	"time"

	"github.com/simonvetter/modbus"

	"framed/drivers/modbusrtu/rtusim"
	"framed/drivers/serialtest"
)

// serve runs s on a pty until the test ends and returns the pty.
func serve(t *testing.T, s *rtusim.Slave) *serialtest.Pty {
	p := serialtest.OpenPty(t)
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan struct{})
	go func() {
		defer close(done)
		s.Serve(ctx, func() rtusim.Conn {
			if m := p.Master(); m != nil {
				return m
			}
			return nil
		})
	}()
	// The pty master does not take read deadlines: unplugging it is what
	// ends a pending read.
	t.Cleanup(func() { cancel(); p.Unplug(); <-done })
	return p
}

// The simonvetter/modbus client, an independent Modbus implementation,
// reads registers from the slave over a pty.
func TestServeAnswersLibraryClientIntegration(t *testing.T) {
	s, err := rtusim.NewSlave(3)
	if err != nil {
		t.Fatal(err)
	}
	s.SetHolding(100, 0x1234, 0xABCD)
	s.SetInput(7, 0x4020, 0x0000) // 2.5 as an IEEE 754 single, high word first
	p := serve(t, s)
	mc, err := modbus.NewClient(&modbus.ClientConfiguration{
		URL: "rtu://" + p.Path(), Speed: 115200, DataBits: 8, Parity: modbus.PARITY_NONE, StopBits: 1,
		Timeout: 500 * time.Millisecond, Logger: log.New(io.Discard, "", 0),
	})
	if err != nil {
		t.Fatal(err)
	}
	mc.SetUnitId(3)
	if err := mc.Open(); err != nil {
		t.Fatal(err)
	}
	defer mc.Close()
	regs, err := mc.ReadRegisters(100, 2, modbus.HOLDING_REGISTER)
	if err != nil || len(regs) != 2 || regs[0] != 0x1234 || regs[1] != 0xABCD {
		t.Errorf("holding 100..101 = %04X, %v; want 1234 ABCD", regs, err)
	}
	f, err := mc.ReadFloat32(7, modbus.INPUT_REGISTER)
	if err != nil || f != 2.5 {
		t.Errorf("input float32 at 7 = %v, %v; want 2.5", f, err)
	}
	s.QueueFaults(rtusim.ReadHolding, rtusim.Exception)
	if _, err := mc.ReadRegisters(100, 1, modbus.HOLDING_REGISTER); err == nil {
		t.Errorf("an exception answer read as success")
	}
	if n, bad := s.Stats(); n != 3 || bad != 0 {
		t.Errorf("stats: %d requests, %d bad; want 3, 0", n, bad)
	}
}
