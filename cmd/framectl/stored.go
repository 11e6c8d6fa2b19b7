package main

import (
	"context"
	"encoding/json"
	"fmt"
	"math"

	"framed/daemon"
	"framed/daemon/store"
	"framed/reduce"
)

// loadStoredTest fetches a stored test's samples and latest result, from
// the running daemon or, when none runs, from its store directly.
func loadStoredTest(ctx context.Context, dir, id string) (reduce.Curve, reduce.Result, error) {
	var c reduce.Curve
	var res reduce.Result
	var cols struct {
		TimeS       []float64  `json:"time_s"`
		ForceN      []*float64 `json:"force_N"`
		ExtensionMM []*float64 `json:"extension_mm"`
		CrossheadMM []*float64 `json:"crosshead_mm"`
	}
	var doc json.RawMessage
	err := withStore(ctx, dir, daemon.Request{Op: "samples", TestID: id}, &cols, func(db *store.DB) error {
		var err error
		if c, err = db.ReadSamples(id); err != nil {
			return err
		}
		doc, _, err = db.Result(id)
		return err
	})
	if err != nil {
		return c, res, fmt.Errorf("test %q: %w", id, err)
	}
	if doc == nil { // answered by the daemon
		c = reduce.Curve{TimeS: cols.TimeS, ForceN: unnull(cols.ForceN), ExtensionMM: unnull(cols.ExtensionMM), CrossheadMM: unnull(cols.CrossheadMM)}
		if err := callDaemon(ctx, dir, daemon.Request{Op: "result", TestID: id}, &doc); err != nil {
			return c, res, fmt.Errorf("result of %q: %w", id, err)
		}
	}
	if err := json.Unmarshal(doc, &res); err != nil {
		return c, res, fmt.Errorf("result of %q: %w", id, err)
	}
	return c, res, nil
}

func unnull(v []*float64) []float64 {
	if v == nil {
		return nil
	}
	out := make([]float64, len(v))
	for i, p := range v {
		if p == nil {
			out[i] = math.NaN()
		} else {
			out[i] = *p
		}
	}
	return out
}
