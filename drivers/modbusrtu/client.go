package modbusrtu

import (
	"errors"
	"fmt"
	"io"
	"log"
	"time"

	"github.com/simonvetter/modbus"
)

// Client is the little of a Modbus client the driver uses; the
// simonvetter/modbus client satisfies it, and tests can fake it.
type Client interface {
	// ReadRegisters reads count registers from start; input selects
	// function 4 (input registers) instead of 3 (holding registers).
	ReadRegisters(start, count uint16, input bool) ([]uint16, error)
	Close() error
}

// Dialer opens a client on the configured port.
type Dialer func(c Config) (Client, error)

type libClient struct{ mc *modbus.ModbusClient }

func (l libClient) ReadRegisters(start, count uint16, input bool) ([]uint16, error) {
	kind := modbus.HOLDING_REGISTER
	if input {
		kind = modbus.INPUT_REGISTER
	}
	return l.mc.ReadRegisters(start, count, kind)
}

func (l libClient) Close() error { return l.mc.Close() }

// dialRTU opens c.Port as a Modbus RTU link through simonvetter/modbus
// (which opens the port with goburrow/serial; a pty works too). The
// library's own log goes nowhere: every error it logs is also returned
// and counted here.
func dialRTU(c Config) (Client, error) {
	parity := modbus.PARITY_EVEN
	switch c.Parity {
	case "none":
		parity = modbus.PARITY_NONE
	case "odd":
		parity = modbus.PARITY_ODD
	}
	mc, err := modbus.NewClient(&modbus.ClientConfiguration{
		URL:      "rtu://" + c.Port,
		Speed:    uint(c.BaudRate),
		DataBits: uint(c.DataBits),
		Parity:   parity,
		StopBits: uint(c.StopBits),
		Timeout:  time.Duration(c.TimeoutMS) * time.Millisecond,
		Logger:   log.New(io.Discard, "", 0),
	})
	if err != nil {
		return nil, fmt.Errorf("modbus client: %w", err)
	}
	if err := mc.SetUnitId(uint8(c.SlaveID)); err != nil {
		return nil, fmt.Errorf("modbus unit id: %w", err)
	}
	if err := mc.Open(); err != nil {
		return nil, err
	}
	return libClient{mc}, nil
}

// failure classifies a poll error for the counters and the retry policy.
type failure int

const (
	failCRC failure = iota
	failTimeout
	failException // the slave answered with an exception code
	failProtocol  // short or malformed frame, wrong unit id
	failLink      // the port itself failed: the device is gone
)

func classify(err error) failure {
	var me modbus.Error
	if !errors.As(err, &me) {
		return failLink
	}
	switch {
	case errors.Is(err, modbus.ErrBadCRC):
		return failCRC
	case errors.Is(err, modbus.ErrRequestTimedOut):
		return failTimeout
	case errors.Is(err, modbus.ErrShortFrame), errors.Is(err, modbus.ErrProtocolError),
		errors.Is(err, modbus.ErrBadUnitId), errors.Is(err, modbus.ErrUnexpectedParameters):
		return failProtocol
	}
	return failException
}
