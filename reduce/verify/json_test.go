package verify

import (
	"encoding/json"
	"strings"
	"testing"
)

// TestForceReportJSONContract checks the field names the project's design
// fixes for `framectl verify --json`, and that a missing class is null.
func TestForceReportJSONContract(t *testing.T) {
	rd := append(full(1000, 1000, 1000, 1000), Reading{Series1, 50, 50}, Reading{Series2, 50, 50}, Reading{Series3, 50, 50})
	rep, err := ClassifyForce(rd, 1, 0) // a at 50 N = 2 %: no class
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(rep)
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]json.RawMessage
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"points", "f0_pct", "ranges", "astm_e4_pass"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("missing %q in %s", k, b)
		}
	}
	var pts []map[string]json.RawMessage
	if err := json.Unmarshal(doc["points"], &pts); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"reference_N", "q_pct", "b_pct", "v_pct", "a_pct", "class"} {
		if _, ok := pts[0][k]; !ok {
			t.Errorf("point lacks %q", k)
		}
	}
	if string(pts[0]["class"]) != "null" || string(pts[1]["class"]) != `"0.5"` || string(pts[0]["v_pct"]) != "null" {
		t.Errorf("classes %s %s, v %s: want null, \"0.5\", null", pts[0]["class"], pts[1]["class"], pts[0]["v_pct"])
	}
	var rngs []map[string]json.RawMessage
	if err := json.Unmarshal(doc["ranges"], &rngs); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"from_N", "to_N", "class"} {
		if _, ok := rngs[0][k]; !ok {
			t.Errorf("range lacks %q", k)
		}
	}
	// Round trip through UnmarshalJSON.
	var back ForceReport
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	if back.Points[1].Class != Class05 || back.Points[0].Class != NoClass || back.Ranges[1].Class != Class05 {
		t.Errorf("round trip lost classes: %+v", back.Ranges)
	}
}

func TestClassJSON(t *testing.T) {
	for c, want := range map[Class]string{NoClass: "null", Class02: `"0.2"`, Class05: `"0.5"`, Class1: `"1"`, Class2: `"2"`, Class3: `"3"`} {
		b, err := json.Marshal(c)
		if err != nil || string(b) != want {
			t.Errorf("%v -> %s, %v; want %s", c, b, err, want)
		}
	}
	var c Class
	for _, bad := range []string{`"4"`, `1`, `"x"`} {
		if err := json.Unmarshal([]byte(bad), &c); err == nil || !strings.Contains(err.Error(), "class") {
			t.Errorf("%s: err %v", bad, err)
		}
	}
	if Class1.Worse(Class3) != Class3 || Class05.Worse(NoClass) != NoClass || Class2.Worse(Class05) != Class2 {
		t.Error("Worse is wrong")
	}
}
