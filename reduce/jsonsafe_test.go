package reduce

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// A hold without an extensometer and a stray NaN quantity still give a
// document that encodes, with null where there is no number.
func TestResultWithNonFiniteValuesEncodes(t *testing.T) {
	inf := math.Inf(1)
	r := Result{
		Holds:      []Hold{{StartS: 1, SettledS: 2, EndS: 3, ForceN: 14.7, ExtensionMM: math.NaN()}},
		Unloads:    []Unload{{TimeS: 4, AfterForceN: 14.7, SetMM: math.NaN()}},
		Quantities: []Quantity{{Symbol: "Fm", Value: 10, Unit: "N", U: &inf}, {Symbol: "E", Value: math.NaN(), Unit: "GPa"}},
	}
	r.Finite()
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatalf("does not encode: %v", err)
	}
	s := string(b)
	for _, want := range []string{`"extension_mm":null`, `"set_mm":null`, `"dropped-non-finite-E"`} {
		if !strings.Contains(s, want) {
			t.Errorf("%s lacks %s", s, want)
		}
	}
	if strings.Contains(s, `"symbol":"E"`) || strings.Contains(s, `"u":`) {
		t.Errorf("non-finite values kept: %s", s)
	}
	var back Result
	if err := json.Unmarshal(b, &back); err != nil || !math.IsNaN(back.Holds[0].ExtensionMM) || back.Holds[0].ForceN != 14.7 {
		t.Errorf("round trip: %+v %v", back.Holds, err)
	}
}
