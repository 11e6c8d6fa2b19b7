package drivers

import (
	"context"
	"time"
)

// Quantity says what a channel measures. The daemon maps channels to the
// frame's force, extension and crosshead signals by quantity, so a driver
// never needs to know how the rest of the frame is wired.
type Quantity string

const (
	// QuantityForce is the load on the specimen, in N once calibrated.
	QuantityForce Quantity = "force"
	// QuantityExtension is the extensometer reading over Le, in mm.
	QuantityExtension Quantity = "extension"
	// QuantityCrosshead is the crosshead (or piston) travel, in mm.
	QuantityCrosshead Quantity = "crosshead"
	// QuantityOther is anything else a board reports (temperature, ...).
	QuantityOther Quantity = "other"
)

// Channel describes one signal of a driver.
type Channel struct {
	// Name is unique within one driver, e.g. "force" or "ext".
	Name     string
	Quantity Quantity
	// Unit is "N" or "mm" for engineering values, "counts" for raw ADC or
	// encoder counts that the daemon's calibration turns into N or mm.
	Unit string
	// RangeMax is the channel's full scale in Unit (0 when unknown). The
	// start detector sets its threshold relative to it.
	RangeMax float64
	// Resolution is the smallest step the channel can show, in Unit.
	Resolution float64
}

// Info is what a driver says about itself.
type Info struct {
	// Driver is the driver kind ("sim", "lineserial", ...).
	Driver  string
	Version string
	// Channels in the order of Batch.Values.
	Channels []Channel
	// SampleRateHz is the nominal rate (0 when the device decides).
	SampleRateHz float64
}

// Batch is a run of samples in columns: Values[ch][i] is channel ch at
// TimeNS[i]. Columns keep the hot path free of per-sample allocations.
// A batch whose Err is set is the last one of its stream.
type Batch struct {
	// Seq counts batches from 0 within one stream, so a receiver sees loss.
	Seq uint64
	// TimeNS are the sample instants on the driver's clock, Unix nanoseconds.
	TimeNS []int64
	// Values holds one column per channel of Info.Channels; NaN means no
	// reading (e.g. an extensometer that was removed).
	Values [][]float64
	// GapBefore is set when the driver lost samples just before this batch
	// (device reopened, garbled lines dropped); the daemon records the gap.
	GapBefore time.Duration
	// Err ends the stream with a reason.
	Err error
}

// Health is a driver's own view of its device.
type Health struct {
	OK      bool
	Message string
	// Counters are monotone event counts, e.g. "garbled_lines", "crc_errors",
	// "reopens", so an operator can see a sick cable before it fails.
	Counters map[string]uint64
}

// Driver is the contract every sensor driver fulfils, in process or behind
// the go-plugin shims. It is a plain interface so drivers and the daemon
// never touch generated protobuf types.
type Driver interface {
	// Describe returns what the driver is before any configuration.
	Describe(ctx context.Context) (Info, error)
	// Configure validates config (JSON, the driver's own schema) before any
	// I/O and returns the channels it will stream. A bad config returns an
	// error wrapping ErrBadConfig and changes nothing.
	Configure(ctx context.Context, config []byte) (Info, error)
	// Stream starts acquisition. Batches arrive on the channel until ctx is
	// cancelled (the channel is then closed) or a batch carries Err.
	Stream(ctx context.Context) (<-chan Batch, error)
	// Health reports the device's state and counters.
	Health(ctx context.Context) (Health, error)
}
