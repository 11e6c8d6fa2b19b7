package modbusrtu

import (
	"context"
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
	if len(c.Channels) != 2 || c.Channels[0].Quantity != "force" || *c.Retries != 2 {
		t.Errorf("sample %+v", c)
	}
	// int32 at 0.1 N per count: full scale 2147483647 * 0.1 N unless
	// range_max says otherwise (the sample says 50000).
	if info := c.Info(); info.Channels[0].RangeMax != 50000 || info.Channels[0].Resolution != 0.1 {
		t.Errorf("force channel %+v", info.Channels[0])
	}
}

func TestParseConfigRefusesBadConfigs(t *testing.T) {
	ch := `"channels":[{"name":"f","quantity":"force","unit":"counts","address":0,"type":"int16"}]`
	cases := map[string]struct{ json, want string }{
		"unknown key":     {`{"port":"p","slave_id":1,"slave":2,` + ch + `}`, "unknown field"},
		"missing port":    {`{"slave_id":1,` + ch + `}`, "port"},
		"bad baud":        {`{"port":"p","slave_id":1,"baud":12000,` + ch + `}`, "baud 12000"},
		"bad parity":      {`{"port":"p","slave_id":1,"parity":"mark",` + ch + `}`, "parity"},
		"bad stop bits":   {`{"port":"p","slave_id":1,"stop_bits":3,` + ch + `}`, "stop_bits"},
		"slave id 248":    {`{"port":"p","slave_id":248,` + ch + `}`, "slave_id 248"},
		"poll rate":       {`{"port":"p","slave_id":1,"poll_hz":5000,` + ch + `}`, "poll_hz"},
		"timeout":         {`{"port":"p","slave_id":1,"timeout_ms":1,` + ch + `}`, "timeout_ms"},
		"retries":         {`{"port":"p","slave_id":1,"retries":-1,` + ch + `}`, "retries"},
		"register kind":   {`{"port":"p","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","register":"coil","type":"int16"}]}`, "register \"coil\""},
		"word order":      {`{"port":"p","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int32","word_order":"mixed"}]}`, "word_order"},
		"address too big": {`{"port":"p","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","address":65535,"type":"int32"}]}`, "address 65535"},
		"scaled counts":   {`{"port":"p","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int32","scale":0.1}]}`, "counts are not scaled"},
		"no channels":     {`{"port":"p","slave_id":1}`, "channels"},
		"duplicate name":  {`{"port":"p","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"},{"name":"f","quantity":"force","unit":"counts","address":1,"type":"int16"}]}`, "twice"},
		"not json":        {`slave=1`, "invalid character"},
	}
	for name, tc := range cases {
		t.Run(name, func(t *testing.T) {
			_, err := ParseConfig([]byte(tc.json))
			if !errors.Is(err, drivers.ErrBadConfig) || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("err %v, want ErrBadConfig mentioning %q", err, tc.want)
			}
		})
	}
}

func TestParityDefaultsFollowSerialLineRules(t *testing.T) {
	// Modbus over serial line: even parity by default; without parity two
	// stop bits keep the 11-bit character (from memory).
	c, err := ParseConfig([]byte(`{"port":"p","slave_id":1,"channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"}]}`))
	if err != nil || c.Parity != "even" || c.StopBits != 1 {
		t.Errorf("defaults: %v %q %d", err, c.Parity, c.StopBits)
	}
	c, err = ParseConfig([]byte(`{"port":"p","slave_id":1,"parity":"none","channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"}]}`))
	if err != nil || c.StopBits != 2 {
		t.Errorf("no parity: %v %d stop bits", err, c.StopBits)
	}
}

func TestStreamContractErrors(t *testing.T) {
	ctx := context.Background()
	d := NewWithDialer(func(Config) (Client, error) { return nil, errors.New("no such file") })
	if _, err := d.Stream(ctx); !errors.Is(err, drivers.ErrNotConfigured) {
		t.Errorf("Stream before Configure: %v", err)
	}
	if _, err := d.Configure(ctx, SampleConfig); err != nil {
		t.Fatal(err)
	}
	if _, err := d.Stream(ctx); !errors.Is(err, drivers.ErrDeviceGone) {
		t.Errorf("Stream on a missing port: %v, want ErrDeviceGone", err)
	}
	fake := &fakeClient{regs: map[string]map[uint16]uint16{"holding": {}, "input": {}}, faults: map[string][]error{}}
	d = NewWithDialer(func(Config) (Client, error) { return fake, nil })
	if _, err := d.Configure(ctx, SampleConfig); err != nil {
		t.Fatal(err)
	}
	sctx, cancel := context.WithCancel(ctx)
	ch, err := d.Stream(sctx)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := d.Stream(sctx); !errors.Is(err, drivers.ErrStreaming) {
		t.Errorf("second Stream: %v", err)
	}
	if _, err := d.Configure(ctx, SampleConfig); !errors.Is(err, drivers.ErrStreaming) {
		t.Errorf("Configure while streaming: %v", err)
	}
	<-ch
	cancel()
	for range ch {
	}
	fake.mu.Lock()
	defer fake.mu.Unlock()
	if !fake.closed {
		t.Error("client not closed after the stream ended")
	}
}
