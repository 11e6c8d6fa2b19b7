package lineserial

import (
	"errors"
	"strings"
	"testing"

	"framed/drivers"
)

func TestSampleConfigIsValid(t *testing.T) {
	c, err := ParseConfig(SampleConfig)
	if err != nil {
		t.Fatalf("embedded sample.json: %v", err)
	}
	info := c.Info()
	if len(info.Channels) != 2 || info.Channels[0].Quantity != drivers.QuantityForce ||
		info.Channels[1].Unit != "mm" {
		t.Errorf("sample channels %+v", info.Channels)
	}
	// A signed 24-bit converter spans -8388608..8388607 (two's complement
	// range, common practice for 24-bit bridge ADCs).
	if info.Channels[0].RangeMax != 8388607 || info.Channels[0].Resolution != 1 {
		t.Errorf("force range %v resolution %v, want 8388607 and 1", info.Channels[0].RangeMax, info.Channels[0].Resolution)
	}
}

func TestParseConfigRefusesBadConfigs(t *testing.T) {
	base := `"port":"/dev/ttyACM0","format":"delimited","fields":["t","f"],"channels":[{"name":"force","field":"f","quantity":"force","unit":"counts"}]`
	cases := map[string]struct{ json, want string }{
		"unknown field":      {`{` + base + `,"bauds":9600}`, "unknown field"},
		"missing port":       {`{"format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`, "port"},
		"bad baud":           {`{` + base + `,"baud":12345}`, "baud 12345"},
		"bad parity":         {`{` + base + `,"parity":"mark"}`, "parity"},
		"bad stop bits":      {`{` + base + `,"stop_bits":3}`, "stop_bits"},
		"bad data bits":      {`{` + base + `,"data_bits":9}`, "data_bits"},
		"unknown field name": {`{"port":"p","format":"delimited","fields":["t","f"],"channels":[{"name":"force","field":"g","quantity":"force","unit":"counts"}]}`, `field "g"`},
		"bad time field":     {`{` + base + `,"time_field":"ts"}`, "time_field"},
		"bad checksum":       {`{` + base + `,"checksum":"crc32"}`, "checksum"},
		"bad quantity":       {`{"port":"p","format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"torque","unit":"counts"}]}`, "quantity"},
		"scaled counts":      {`{"port":"p","format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts","scale":2}]}`, "counts are not scaled"},
		"mm for force":       {`{"port":"p","format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"mm"}]}`, "unit mm"},
		"no channels":        {`{"port":"p","format":"keyvalue"}`, "channels"},
		"missing format":     {`{"port":"p","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`, "format"},
		"fields in kv":       {`{"port":"p","format":"keyvalue","fields":["f"],"channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"}]}`, "fields"},
		"digit delimiter":    {`{` + base + `,"delimiter":"1"}`, "delimiter"},
		"duplicate channel":  {`{"port":"p","format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"},{"name":"f","field":"g","quantity":"force","unit":"counts"}]}`, "twice"},
		"shared field":       {`{"port":"p","format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts"},{"name":"g","field":"f","quantity":"force","unit":"counts"}]}`, "already used"},
		"raw bits":           {`{"port":"p","format":"keyvalue","channels":[{"name":"f","field":"f","quantity":"force","unit":"counts","raw_bits":64}]}`, "raw_bits"},
		"time bits":          {`{` + base + `,"time_bits":8}`, "time_bits"},
		"trailing data":      {`{` + base + `} {}`, "trailing"},
		"not json":           {`port=/dev/tty`, "invalid character"},
	}
	for name, tc := range cases {
		t.Run(name, func(t *testing.T) {
			_, err := ParseConfig([]byte(tc.json))
			if !errors.Is(err, drivers.ErrBadConfig) {
				t.Fatalf("err %v, want ErrBadConfig", err)
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("err %q does not mention %q", err, tc.want)
			}
		})
	}
}
