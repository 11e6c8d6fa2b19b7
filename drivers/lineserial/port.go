package lineserial

import (
	"time"

	"go.bug.st/serial"
)

// Port is the little of a serial port the driver uses. go.bug.st/serial
// ports satisfy it, and so does the playback fake in drivers/serialtest.
// Read returns 0, nil when the read timeout passes with no data, and an
// error when the device is gone.
type Port interface {
	Read(p []byte) (int, error)
	Write(p []byte) (int, error)
	Close() error
	SetReadTimeout(d time.Duration) error
}

// Opener opens the configured port.
type Opener func(c Config) (Port, error)

// openSerial opens c.Port through go.bug.st/serial with the configured
// framing. On a pseudo-terminal the kernel accepts (and ignores) the baud
// rate and framing, so the same code path runs in end-to-end tests.
func openSerial(c Config) (Port, error) {
	mode := &serial.Mode{BaudRate: c.BaudRate, DataBits: c.DataBits}
	switch c.Parity {
	case "even":
		mode.Parity = serial.EvenParity
	case "odd":
		mode.Parity = serial.OddParity
	default:
		mode.Parity = serial.NoParity
	}
	switch c.StopBits {
	case 1.5:
		mode.StopBits = serial.OnePointFiveStopBits
	case 2:
		mode.StopBits = serial.TwoStopBits
	default:
		mode.StopBits = serial.OneStopBit
	}
	p, err := serial.Open(c.Port, mode)
	if err != nil {
		return nil, err
	}
	return p, nil
}
