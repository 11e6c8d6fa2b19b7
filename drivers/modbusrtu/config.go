package modbusrtu

import (
	"fmt"
	"math"
	"slices"

	"framed/drivers"
)

// Config is the driver's JSON configuration (see sample.json).
type Config struct {
	// Port is the RS-485 adapter, best a /dev/serial/by-id/... link.
	Port string `json:"port"`
	// BaudRate (default 19200), DataBits 7 or 8 (default 8), Parity
	// none|even|odd (default even, the Modbus serial line default) and
	// StopBits 1 or 2 (default 1, or 2 without parity as the serial line
	// specification asks).
	BaudRate int    `json:"baud"`
	DataBits int    `json:"data_bits"`
	Parity   string `json:"parity"`
	StopBits int    `json:"stop_bits"`
	// SlaveID is the indicator's unit address, 1..247.
	SlaveID int `json:"slave_id"`
	// PollHz is the poll rate (default 20).
	PollHz float64 `json:"poll_hz"`
	// TimeoutMS is how long one request waits for its answer (default 100,
	// at most 1000: a request in flight cannot be interrupted, so this also
	// bounds how long stopping a stream can take).
	TimeoutMS int `json:"timeout_ms"`
	// Retries after a CRC error, timeout or exception within one poll
	// (default 2; 0 means none).
	Retries *int `json:"retries"`
	// BatchMS bounds how long samples wait before they are sent (default 50).
	BatchMS int `json:"batch_ms"`
	// ReopenMaxMS caps the backoff between reopen attempts (default 2000).
	ReopenMaxMS int `json:"reopen_max_ms"`
	// Channels map registers to channels, in Batch order.
	Channels []ChannelConfig `json:"channels"`
}

// ChannelConfig maps one register value to one channel.
type ChannelConfig struct {
	Name     string `json:"name"`
	Quantity string `json:"quantity"`
	// Unit is "counts" (the daemon calibrates) or "N"/"mm" once Scale and
	// Offset make engineering units.
	Unit string `json:"unit"`
	// Register is "holding" (function 3, default) or "input" (function 4).
	Register string `json:"register"`
	// Address is the zero-based register address on the wire (the
	// indicator manual's "40001" is address 0).
	Address int `json:"address"`
	// Type is uint16, int16, uint32, int32 or float32.
	Type ValueType `json:"type"`
	// WordOrder of 32-bit values: "big" (high word first, default) or
	// "little".
	WordOrder WordOrder `json:"word_order"`
	// value = raw * Scale + Offset (defaults 1 and 0).
	Scale  *float64 `json:"scale"`
	Offset float64  `json:"offset"`
	// RangeMax and Resolution in Unit (defaults from Type and Scale).
	RangeMax   float64 `json:"range_max"`
	Resolution float64 `json:"resolution"`
}

// maxRegsPerRead is the Modbus limit for one read of registers (125).
const maxRegsPerRead = 125

var standardBauds = []int{1200, 2400, 4800, 9600, 19200, 38400, 57600, 115200, 230400}

// ParseConfig decodes and validates a configuration without any I/O. Every
// error wraps drivers.ErrBadConfig.
func ParseConfig(data []byte) (Config, error) {
	var c Config
	if err := drivers.DecodeConfig("modbusrtu", data, &c); err != nil {
		return Config{}, err
	}
	if err := c.normalise(); err != nil {
		return Config{}, fmt.Errorf("%w: modbusrtu: %v", drivers.ErrBadConfig, err)
	}
	return c, nil
}

func (c *Config) normalise() error {
	if c.Port == "" {
		return fmt.Errorf("missing \"port\" (e.g. /dev/serial/by-id/...)")
	}
	if c.BaudRate == 0 {
		c.BaudRate = 19200
	}
	if !slices.Contains(standardBauds, c.BaudRate) {
		return fmt.Errorf("baud %d is not a standard rate %v", c.BaudRate, standardBauds)
	}
	if c.DataBits == 0 {
		c.DataBits = 8
	}
	if c.DataBits != 7 && c.DataBits != 8 {
		return fmt.Errorf("data_bits %d: want 7 or 8", c.DataBits)
	}
	if c.Parity == "" {
		c.Parity = "even"
	}
	if c.Parity != "none" && c.Parity != "even" && c.Parity != "odd" {
		return fmt.Errorf("parity %q: want none, even or odd", c.Parity)
	}
	if c.StopBits == 0 {
		c.StopBits = 1
		if c.Parity == "none" {
			c.StopBits = 2
		}
	}
	if c.StopBits != 1 && c.StopBits != 2 {
		return fmt.Errorf("stop_bits %d: want 1 or 2", c.StopBits)
	}
	if c.SlaveID < 1 || c.SlaveID > 247 {
		return fmt.Errorf("slave_id %d: want 1..247 (0 is broadcast, which never answers)", c.SlaveID)
	}
	if c.PollHz == 0 {
		c.PollHz = 20
	}
	if !(c.PollHz >= 0.1 && c.PollHz <= 1000) {
		return fmt.Errorf("poll_hz %v not in 0.1..1000", c.PollHz)
	}
	if c.TimeoutMS == 0 {
		c.TimeoutMS = 100
	}
	if c.TimeoutMS < 5 || c.TimeoutMS > 1000 {
		return fmt.Errorf("timeout_ms %d not in 5..1000", c.TimeoutMS)
	}
	if c.Retries == nil {
		r := 2
		c.Retries = &r
	}
	if *c.Retries < 0 || *c.Retries > 10 {
		return fmt.Errorf("retries %d not in 0..10", *c.Retries)
	}
	if c.BatchMS == 0 {
		c.BatchMS = 50
	}
	if c.BatchMS < 1 || c.BatchMS > 5000 {
		return fmt.Errorf("batch_ms %d not in 1..5000", c.BatchMS)
	}
	if c.ReopenMaxMS == 0 {
		c.ReopenMaxMS = 2000
	}
	if c.ReopenMaxMS < 10 || c.ReopenMaxMS > 60000 {
		return fmt.Errorf("reopen_max_ms %d not in 10..60000", c.ReopenMaxMS)
	}
	if len(c.Channels) == 0 {
		return fmt.Errorf("no \"channels\"")
	}
	names := map[string]bool{}
	for i := range c.Channels {
		if err := c.Channels[i].normalise(); err != nil {
			return fmt.Errorf("channel %d (%q): %v", i, c.Channels[i].Name, err)
		}
		if names[c.Channels[i].Name] {
			return fmt.Errorf("channel name %q used twice", c.Channels[i].Name)
		}
		names[c.Channels[i].Name] = true
	}
	for _, b := range c.blocks() {
		if b.count > maxRegsPerRead {
			return fmt.Errorf("%s registers %d..%d span %d registers; one read takes at most %d",
				b.kind, b.start, b.start+b.count-1, b.count, maxRegsPerRead)
		}
	}
	return nil
}

func (ch *ChannelConfig) normalise() error {
	if ch.Name == "" || len(ch.Name) > 32 {
		return fmt.Errorf("name: want 1..32 characters")
	}
	q := drivers.Quantity(ch.Quantity)
	switch q {
	case drivers.QuantityForce, drivers.QuantityExtension, drivers.QuantityCrosshead, drivers.QuantityOther:
	default:
		return fmt.Errorf("quantity %q: want force, extension, crosshead or other", ch.Quantity)
	}
	if ch.Register == "" {
		ch.Register = "holding"
	}
	if ch.Register != "holding" && ch.Register != "input" {
		return fmt.Errorf("register %q: want holding or input", ch.Register)
	}
	if ch.Type.Words() == 0 {
		return fmt.Errorf("type %q: want uint16, int16, uint32, int32 or float32", ch.Type)
	}
	if ch.WordOrder == "" {
		ch.WordOrder = HighWordFirst
	}
	if ch.WordOrder != HighWordFirst && ch.WordOrder != LowWordFirst {
		return fmt.Errorf("word_order %q: want big or little", ch.WordOrder)
	}
	if ch.Address < 0 || ch.Address+ch.Type.Words()-1 > 65535 {
		return fmt.Errorf("address %d: want 0..%d for %s", ch.Address, 65536-ch.Type.Words(), ch.Type)
	}
	if ch.Scale == nil {
		one := 1.0
		ch.Scale = &one
	}
	if *ch.Scale == 0 || math.IsNaN(*ch.Scale) || math.IsInf(*ch.Scale, 0) || math.IsNaN(ch.Offset) || math.IsInf(ch.Offset, 0) {
		return fmt.Errorf("scale %v / offset %v: want finite values, scale not 0", *ch.Scale, ch.Offset)
	}
	switch ch.Unit {
	case "counts":
		if *ch.Scale != 1 || ch.Offset != 0 {
			return fmt.Errorf("unit counts with scale %v offset %v: counts are not scaled (use N or mm)", *ch.Scale, ch.Offset)
		}
	case "N":
		if q != drivers.QuantityForce && q != drivers.QuantityOther {
			return fmt.Errorf("unit N for quantity %s", q)
		}
	case "mm":
		if q != drivers.QuantityExtension && q != drivers.QuantityCrosshead && q != drivers.QuantityOther {
			return fmt.Errorf("unit mm for quantity %s", q)
		}
	default:
		if q != drivers.QuantityOther || ch.Unit == "" {
			return fmt.Errorf("unit %q: want counts, N (force) or mm (extension, crosshead)", ch.Unit)
		}
	}
	if ch.RangeMax < 0 || ch.Resolution < 0 || math.IsNaN(ch.RangeMax) || math.IsNaN(ch.Resolution) {
		return fmt.Errorf("range_max %v / resolution %v must not be negative", ch.RangeMax, ch.Resolution)
	}
	if ch.RangeMax == 0 {
		switch ch.Type {
		case Uint16:
			ch.RangeMax = 65535 * math.Abs(*ch.Scale)
		case Int16:
			ch.RangeMax = 32767 * math.Abs(*ch.Scale)
		case Uint32:
			ch.RangeMax = 4294967295 * math.Abs(*ch.Scale)
		case Int32:
			ch.RangeMax = 2147483647 * math.Abs(*ch.Scale)
		}
	}
	if ch.Resolution == 0 && ch.Type != Float32 {
		ch.Resolution = math.Abs(*ch.Scale)
	}
	return nil
}

// block is one read request: a run of registers of one kind.
type block struct {
	kind  string // holding | input
	start int
	count int
}

// blocks groups the channels into one read per register kind, covering
// every channel's registers (gaps between them are read and ignored:
// one request is far cheaper on a serial line than two).
func (c *Config) blocks() []block {
	var out []block
	for _, kind := range []string{"holding", "input"} {
		lo, hi := math.MaxInt, -1
		for _, ch := range c.Channels {
			if ch.Register != kind {
				continue
			}
			lo = min(lo, ch.Address)
			hi = max(hi, ch.Address+ch.Type.Words()-1)
		}
		if hi >= 0 {
			out = append(out, block{kind: kind, start: lo, count: hi - lo + 1})
		}
	}
	return out
}

// Info returns the channels this configuration streams.
func (c *Config) Info() drivers.Info {
	info := drivers.Info{Driver: DriverName, Version: Version, SampleRateHz: c.PollHz}
	for _, ch := range c.Channels {
		info.Channels = append(info.Channels, drivers.Channel{
			Name: ch.Name, Quantity: drivers.Quantity(ch.Quantity), Unit: ch.Unit,
			RangeMax: ch.RangeMax, Resolution: ch.Resolution,
		})
	}
	return info
}
