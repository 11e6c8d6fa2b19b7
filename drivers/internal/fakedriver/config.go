package fakedriver

import (
	"bytes"
	"encoding/json"
	"fmt"

	"framed/drivers"
)

// Config is the fake driver's JSON configuration.
type Config struct {
	// Channels is the number of channels, 1..64 (default 2).
	Channels int `json:"channels"`
	// SamplesPerBatch is 1..100000 (default 10).
	SamplesPerBatch int `json:"samples_per_batch"`
	// BatchIntervalUS paces the batches; 0 streams as fast as the
	// consumer reads (default 0).
	BatchIntervalUS int `json:"batch_interval_us"`
	// Batches, when > 0, ends the stream after that many batches: with
	// Error if set, else by closing the channel.
	Batches int `json:"batches"`
	// Error is "", "device_gone" or "other".
	Error string `json:"error"`
	// FaultFile, when set, is watched before every batch: once it exists
	// the device counts as failed (see OnFault).
	FaultFile string `json:"fault_file"`
	// OnFault is "end" (the stream ends with ErrDeviceGone, default) or
	// "reopen" (the file is removed and the next batch has a gap).
	OnFault string `json:"on_fault"`
}

// parseConfig decodes and checks raw without touching anything else.
func parseConfig(raw []byte) (Config, error) {
	c := Config{Channels: 2, SamplesPerBatch: 10, OnFault: "end"}
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&c); err != nil {
		return Config{}, fmt.Errorf("%w: fake: %v", drivers.ErrBadConfig, err)
	}
	if dec.More() {
		return Config{}, fmt.Errorf("%w: fake: trailing data after the JSON object", drivers.ErrBadConfig)
	}
	switch {
	case c.Channels < 1 || c.Channels > 64:
		return Config{}, fmt.Errorf("%w: fake: channels %d not in 1..64", drivers.ErrBadConfig, c.Channels)
	case c.SamplesPerBatch < 1 || c.SamplesPerBatch > 100000:
		return Config{}, fmt.Errorf("%w: fake: samples_per_batch %d not in 1..100000", drivers.ErrBadConfig, c.SamplesPerBatch)
	case c.BatchIntervalUS < 0:
		return Config{}, fmt.Errorf("%w: fake: negative batch_interval_us", drivers.ErrBadConfig)
	case c.Batches < 0:
		return Config{}, fmt.Errorf("%w: fake: negative batches", drivers.ErrBadConfig)
	case c.Error != "" && c.Error != "device_gone" && c.Error != "other":
		return Config{}, fmt.Errorf("%w: fake: unknown error %q", drivers.ErrBadConfig, c.Error)
	case c.OnFault != "end" && c.OnFault != "reopen":
		return Config{}, fmt.Errorf("%w: fake: unknown on_fault %q", drivers.ErrBadConfig, c.OnFault)
	}
	return c, nil
}

func (c Config) channels() []drivers.Channel {
	out := make([]drivers.Channel, c.Channels)
	for i := range out {
		switch i {
		case 0:
			out[i] = drivers.Channel{Name: "force", Quantity: drivers.QuantityForce, Unit: "N", RangeMax: 10000, Resolution: 0.1}
		case 1:
			out[i] = drivers.Channel{Name: "ext", Quantity: drivers.QuantityExtension, Unit: "mm", RangeMax: 5, Resolution: 0.0001}
		case 2:
			out[i] = drivers.Channel{Name: "crosshead", Quantity: drivers.QuantityCrosshead, Unit: "mm", RangeMax: 500, Resolution: 0.01}
		default:
			out[i] = drivers.Channel{Name: fmt.Sprintf("aux%d", i), Quantity: drivers.QuantityOther, Unit: "counts"}
		}
	}
	return out
}
