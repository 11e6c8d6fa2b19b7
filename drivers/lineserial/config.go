package lineserial

import (
	"fmt"
	"math"
	"slices"

	"framed/drivers"
)

// Config is the driver's JSON configuration (see sample.json).
type Config struct {
	// Port is the serial device, best a stable udev link such as
	// /dev/serial/by-id/usb-... so a replugged board is found again.
	Port string `json:"port"`
	// BaudRate of the board's UART (default 115200).
	BaudRate int `json:"baud"`
	// DataBits 5..8 (default 8), Parity none|even|odd (default none),
	// StopBits 1, 1.5 or 2 (default 1).
	DataBits int     `json:"data_bits"`
	Parity   string  `json:"parity"`
	StopBits float64 `json:"stop_bits"`
	// Format is "keyvalue" (t=1 f=2) or "delimited" (1,2).
	Format string `json:"format"`
	// Delimiter separates fields: one byte, default "," for delimited and
	// " " for keyvalue (runs of spaces count as one).
	Delimiter string `json:"delimiter"`
	// Fields names the positions of a delimited line; "_" skips a field.
	// Not used in keyvalue mode, where the keys name themselves.
	Fields []string `json:"fields"`
	// TimeField names the board timestamp field; empty means host receipt
	// times are used.
	TimeField string `json:"time_field"`
	// TimeUnit of the board counter: "us" (default) or "ms".
	TimeUnit string `json:"time_unit"`
	// TimeBits is the width of the board counter, which wraps at
	// 2^TimeBits (default 32: a micros() counter wraps every 71.6 min).
	TimeBits int `json:"time_bits"`
	// Checksum is "none" (default) or "xor": the line ends in "*HH", the
	// XOR of every byte before '*' as two hex digits.
	Checksum string `json:"checksum"`
	// Channels maps fields to the driver's channels, in Batch order.
	Channels []ChannelConfig `json:"channels"`
	// SampleRateHz is the board's nominal rate (informational, 0 = unknown).
	SampleRateHz float64 `json:"sample_rate_hz"`
	// BatchMS and BatchSamples bound a batch: it is sent when either is
	// reached (defaults 25 ms, 256 samples).
	BatchMS      int `json:"batch_ms"`
	BatchSamples int `json:"batch_samples"`
	// MaxLineBytes bounds one line (default 256); longer lines are dropped.
	MaxLineBytes int `json:"max_line_bytes"`
	// ReopenMaxMS caps the backoff between reopen attempts (default 2000).
	ReopenMaxMS int `json:"reopen_max_ms"`
}

// ChannelConfig maps one line field to one channel.
type ChannelConfig struct {
	Name     string `json:"name"`
	Field    string `json:"field"`
	Quantity string `json:"quantity"`
	// Unit is "counts" (the daemon calibrates) or "N"/"mm" when Scale and
	// Offset turn counts into engineering units here.
	Unit string `json:"unit"`
	// RawBits is the converter's signed width: readings outside
	// -2^(RawBits-1) .. 2^(RawBits-1)-1 are counted as out_of_range and
	// become NaN. Default 24 (a 24-bit bridge ADC); 0 turns the check off.
	RawBits *int `json:"raw_bits"`
	// Scale and Offset: value = raw*Scale + Offset (defaults 1 and 0).
	Scale  *float64 `json:"scale"`
	Offset float64  `json:"offset"`
	// RangeMax and Resolution in Unit; defaults derive from RawBits/Scale.
	RangeMax   float64 `json:"range_max"`
	Resolution float64 `json:"resolution"`
}

var standardBauds = []int{1200, 2400, 4800, 9600, 19200, 38400, 57600, 115200,
	230400, 250000, 460800, 500000, 921600, 1000000, 2000000}

// ParseConfig decodes and validates a configuration without any I/O. Every
// error wraps drivers.ErrBadConfig.
func ParseConfig(data []byte) (Config, error) {
	var c Config
	if err := drivers.DecodeConfig("lineserial", data, &c); err != nil {
		return Config{}, err
	}
	if err := c.normalise(); err != nil {
		return Config{}, fmt.Errorf("%w: lineserial: %v", drivers.ErrBadConfig, err)
	}
	return c, nil
}

// normalise fills defaults and checks every field.
func (c *Config) normalise() error {
	if c.Port == "" {
		return fmt.Errorf("missing \"port\" (e.g. /dev/serial/by-id/...)")
	}
	if c.BaudRate == 0 {
		c.BaudRate = 115200
	}
	if !slices.Contains(standardBauds, c.BaudRate) {
		return fmt.Errorf("baud %d is not a standard rate %v", c.BaudRate, standardBauds)
	}
	if c.DataBits == 0 {
		c.DataBits = 8
	}
	if c.DataBits < 5 || c.DataBits > 8 {
		return fmt.Errorf("data_bits %d not in 5..8", c.DataBits)
	}
	if c.Parity == "" {
		c.Parity = "none"
	}
	if c.Parity != "none" && c.Parity != "even" && c.Parity != "odd" {
		return fmt.Errorf("parity %q: want none, even or odd", c.Parity)
	}
	if c.StopBits == 0 {
		c.StopBits = 1
	}
	if c.StopBits != 1 && c.StopBits != 1.5 && c.StopBits != 2 {
		return fmt.Errorf("stop_bits %v: want 1, 1.5 or 2", c.StopBits)
	}
	switch c.Format {
	case "keyvalue":
		if c.Delimiter == "" {
			c.Delimiter = " "
		}
		if len(c.Fields) > 0 {
			return fmt.Errorf("\"fields\" is for the delimited format; keyvalue lines name their own keys")
		}
	case "delimited":
		if c.Delimiter == "" {
			c.Delimiter = ","
		}
		if len(c.Fields) == 0 {
			return fmt.Errorf("delimited format needs \"fields\", the name of each position")
		}
	case "":
		return fmt.Errorf("missing \"format\": keyvalue or delimited")
	default:
		return fmt.Errorf("format %q: want keyvalue or delimited", c.Format)
	}
	if len(c.Delimiter) != 1 || c.Delimiter[0] == '=' || c.Delimiter[0] == '*' ||
		c.Delimiter[0] == '\n' || c.Delimiter[0] == '\r' || c.Delimiter[0] == '-' ||
		c.Delimiter[0] == '.' || (c.Delimiter[0] >= '0' && c.Delimiter[0] <= '9') {
		return fmt.Errorf("delimiter %q: want one byte that cannot appear in a number, '=' or '*'", c.Delimiter)
	}
	seen := map[string]bool{}
	for _, f := range c.Fields {
		if f == "_" {
			continue
		}
		if err := checkName("field", f); err != nil {
			return err
		}
		if seen[f] {
			return fmt.Errorf("field %q listed twice", f)
		}
		seen[f] = true
	}
	known := func(f string) bool { return c.Format == "keyvalue" || seen[f] }
	if c.TimeField != "" {
		if err := checkName("time_field", c.TimeField); err != nil {
			return err
		}
		if !known(c.TimeField) {
			return fmt.Errorf("time_field %q is not one of fields %q", c.TimeField, c.Fields)
		}
	}
	if c.TimeUnit == "" {
		c.TimeUnit = "us"
	}
	if c.TimeUnit != "us" && c.TimeUnit != "ms" {
		return fmt.Errorf("time_unit %q: want us or ms", c.TimeUnit)
	}
	if c.TimeBits == 0 {
		c.TimeBits = 32
	}
	if c.TimeBits < 16 || c.TimeBits > 64 {
		return fmt.Errorf("time_bits %d not in 16..64", c.TimeBits)
	}
	if c.Checksum == "" {
		c.Checksum = "none"
	}
	if c.Checksum != "none" && c.Checksum != "xor" {
		return fmt.Errorf("checksum %q: want none or xor", c.Checksum)
	}
	if len(c.Channels) == 0 {
		return fmt.Errorf("no \"channels\"")
	}
	names := map[string]bool{}
	fieldsUsed := map[string]bool{c.TimeField: c.TimeField != ""}
	for i := range c.Channels {
		if err := c.Channels[i].normalise(); err != nil {
			return fmt.Errorf("channel %d: %v", i, err)
		}
		ch := c.Channels[i]
		if names[ch.Name] {
			return fmt.Errorf("channel name %q used twice", ch.Name)
		}
		names[ch.Name] = true
		if !known(ch.Field) {
			return fmt.Errorf("channel %q: field %q is not one of fields %q", ch.Name, ch.Field, c.Fields)
		}
		if fieldsUsed[ch.Field] {
			return fmt.Errorf("channel %q: field %q already used", ch.Name, ch.Field)
		}
		fieldsUsed[ch.Field] = true
	}
	if c.SampleRateHz < 0 || math.IsNaN(c.SampleRateHz) || c.SampleRateHz > 100000 {
		return fmt.Errorf("sample_rate_hz %v not in 0..100000", c.SampleRateHz)
	}
	if c.BatchMS == 0 {
		c.BatchMS = 25
	}
	if c.BatchMS < 1 || c.BatchMS > 1000 {
		return fmt.Errorf("batch_ms %d not in 1..1000", c.BatchMS)
	}
	if c.BatchSamples == 0 {
		c.BatchSamples = 256
	}
	if c.BatchSamples < 1 || c.BatchSamples > 100000 {
		return fmt.Errorf("batch_samples %d not in 1..100000", c.BatchSamples)
	}
	if c.MaxLineBytes == 0 {
		c.MaxLineBytes = 256
	}
	if c.MaxLineBytes < 16 || c.MaxLineBytes > 4096 {
		return fmt.Errorf("max_line_bytes %d not in 16..4096", c.MaxLineBytes)
	}
	if c.ReopenMaxMS == 0 {
		c.ReopenMaxMS = 2000
	}
	if c.ReopenMaxMS < 10 || c.ReopenMaxMS > 60000 {
		return fmt.Errorf("reopen_max_ms %d not in 10..60000", c.ReopenMaxMS)
	}
	return nil
}

func checkName(what, s string) error {
	if s == "" || len(s) > 32 {
		return fmt.Errorf("%s %q: want 1..32 characters", what, s)
	}
	for i := 0; i < len(s); i++ {
		b := s[i]
		if !(b == '_' || b >= 'a' && b <= 'z' || b >= 'A' && b <= 'Z' || b >= '0' && b <= '9') {
			return fmt.Errorf("%s %q: only letters, digits and '_'", what, s)
		}
	}
	return nil
}

func (ch *ChannelConfig) normalise() error {
	if err := checkName("name", ch.Name); err != nil {
		return err
	}
	if err := checkName("field", ch.Field); err != nil {
		return err
	}
	if ch.Field == "_" {
		return fmt.Errorf("field \"_\" is the skip marker, not a field")
	}
	q := drivers.Quantity(ch.Quantity)
	switch q {
	case drivers.QuantityForce, drivers.QuantityExtension, drivers.QuantityCrosshead, drivers.QuantityOther:
	default:
		return fmt.Errorf("quantity %q: want force, extension, crosshead or other", ch.Quantity)
	}
	if ch.RawBits == nil {
		b := 24
		ch.RawBits = &b
	}
	if *ch.RawBits != 0 && (*ch.RawBits < 8 || *ch.RawBits > 53) {
		return fmt.Errorf("raw_bits %d: want 0 (no check) or 8..53", *ch.RawBits)
	}
	if ch.Scale == nil {
		one := 1.0
		ch.Scale = &one
	}
	if *ch.Scale == 0 || math.IsNaN(*ch.Scale) || math.IsInf(*ch.Scale, 0) ||
		math.IsNaN(ch.Offset) || math.IsInf(ch.Offset, 0) {
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
	if ch.RangeMax == 0 && *ch.RawBits > 0 {
		ch.RangeMax = math.Abs(*ch.Scale) * (math.Exp2(float64(*ch.RawBits-1)) - 1)
	}
	if ch.Resolution == 0 {
		ch.Resolution = math.Abs(*ch.Scale)
	}
	return nil
}

// rawLimits returns the accepted raw range of a channel.
func (ch *ChannelConfig) rawLimits() (lo, hi float64) {
	if *ch.RawBits == 0 {
		return math.Inf(-1), math.Inf(1)
	}
	half := math.Exp2(float64(*ch.RawBits - 1))
	return -half, half - 1
}

// Info returns the channels this configuration streams.
func (c *Config) Info() drivers.Info {
	info := drivers.Info{Driver: DriverName, Version: Version, SampleRateHz: c.SampleRateHz}
	for _, ch := range c.Channels {
		info.Channels = append(info.Channels, drivers.Channel{
			Name: ch.Name, Quantity: drivers.Quantity(ch.Quantity), Unit: ch.Unit,
			RangeMax: ch.RangeMax, Resolution: ch.Resolution,
		})
	}
	return info
}
