package detect

import (
	"errors"
	"math"
	"testing"
)

func TestNewRejectsBadConfig(t *testing.T) {
	for name, cfg := range map[string]Config{
		"no range":          {},
		"negative range":    {ForceRangeN: -5},
		"infinite range":    {ForceRangeN: math.Inf(1)},
		"NaN threshold":     {ForceRangeN: 1000, StartFraction: math.NaN()},
		"negative settle":   {ForceRangeN: 1000, SettleMinS: -1},
		"drop of all":       {ForceRangeN: 1000, BreakDropFraction: 1},
		"hanger over range": {ForceRangeN: 1000, HangerN: 1000},
		"infinite end hold": {ForceRangeN: 1000, EndHoldS: math.Inf(1)},
	} {
		if _, err := New(cfg); !errors.Is(err, ErrBadConfig) {
			t.Errorf("%s: New(%+v) = %v, want ErrBadConfig", name, cfg, err)
		}
	}
}

func TestNewFillsDefaults(t *testing.T) {
	d, err := New(Config{ForceRangeN: 1000, SettleMinS: 2})
	if err != nil {
		t.Fatal(err)
	}
	c := d.Config()
	if c.SettleMinS != 2 || c.StartFraction != DefaultStartFraction || c.BreakDropFraction != DefaultBreakDropFraction || c.EndHoldS != DefaultEndHoldS {
		t.Errorf("defaults not filled as documented: %+v", c)
	}
	if d.State() != Idle || d.State().String() != "idle" || !math.IsNaN(d.StartTimeS()) {
		t.Errorf("new detector: state %v, start %v", d.State(), d.StartTimeS())
	}
	if Running.String() != "running" || Ended.String() != "ended" || State(9).String() != "unknown" {
		t.Error("state names")
	}
}
