package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"framed/reduce"
	"framed/reduce/curvefile"
)

// writeRambergOsgood writes a Ramberg-Osgood curve file (NACA TN 902
// proof-strength form: Rp0.2 exact by construction) with a break at the end.
func writeRambergOsgood(t *testing.T, eMPa, rp, m, s0, le float64) string {
	t.Helper()
	var c reduce.Curve
	n := 3000
	for i := 0; i < n; i++ {
		e := 0.05 * float64(i) / float64(n-1)
		lo, hi := 0.0, 20*rp
		for k := 0; k < 80; k++ {
			mid := (lo + hi) / 2
			if mid/eMPa+0.002*math.Pow(mid/rp, m) > e {
				hi = mid
			} else {
				lo = mid
			}
		}
		c.TimeS = append(c.TimeS, float64(i)*0.1)
		c.ForceN = append(c.ForceN, lo*s0)
		c.ExtensionMM = append(c.ExtensionMM, e*le)
		c.CrossheadMM = append(c.CrossheadMM, e*le*1.3)
	}
	c.TimeS = append(c.TimeS, float64(n)*0.1)
	c.ForceN = append(c.ForceN, 1)
	c.ExtensionMM = append(c.ExtensionMM, math.NaN())
	c.CrossheadMM = append(c.CrossheadMM, 0.05*le*1.3)
	path := filepath.Join(t.TempDir(), "ro.csv")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if err := curvefile.Write(f, c); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestReduceCommandJSON(t *testing.T) {
	path := writeRambergOsgood(t, 68900, 276, 25, 20, 50)
	var out, errb bytes.Buffer
	// Flags after the file name, as the contract check calls it.
	code := run([]string{"reduce", path, "--shape", "rect", "--a0", "2", "--b0", "10", "--L0", "50", "--Lu", "56", "--proof", "0.2,0.1", "--json"}, &out, &errb)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	var doc map[string]any
	dec := json.NewDecoder(&out)
	if err := dec.Decode(&doc); err != nil {
		t.Fatal(err)
	}
	if dec.More() {
		t.Fatal("more than one JSON document")
	}
	for _, key := range []string{"schema", "quantities", "events", "flags", "holds", "unloads"} {
		if _, ok := doc[key]; !ok {
			t.Errorf("document lacks %q", key)
		}
	}
	qs := map[string]map[string]any{}
	for _, q := range doc["quantities"].([]any) {
		m := q.(map[string]any)
		qs[m["symbol"].(string)] = m
	}
	// Rp0.2 276 MPa exact by construction (Ramberg-Osgood); A from Lu:
	// 100 (56 - 50) / 50 = 12 %.
	if v := qs["Rp0.2"]["value"].(float64); math.Abs(v/276-1) > 1e-3 {
		t.Errorf("Rp0.2 %v, want 276", v)
	}
	// Rp0.1 from --proof: 0.002 (s/Rp0.2)^25 = 0.001.
	if v, ok := qs["Rp0.1"]["value"].(float64); !ok || math.Abs(v/(276*math.Pow(0.5, 1.0/25))-1) > 1e-3 {
		t.Errorf("Rp0.1 %v, want %v", qs["Rp0.1"], 276*math.Pow(0.5, 1.0/25))
	}
	if v := qs["A"]["value"].(float64); math.Abs(v-12) > 1e-9 {
		t.Errorf("A %v, want 12", v)
	}
	for sym, unit := range map[string]string{"E": "GPa", "Rm": "MPa", "Fm": "N", "A": "%"} {
		if qs[sym]["unit"] != unit {
			t.Errorf("%s unit %v, want %s", sym, qs[sym]["unit"], unit)
		}
	}
	hasBreak := false
	for _, e := range doc["events"].([]any) {
		if e.(map[string]any)["kind"] == "break" {
			hasBreak = true
		}
	}
	if !hasBreak {
		t.Error("no break event")
	}
}

func TestReduceCommandTable(t *testing.T) {
	path := writeRambergOsgood(t, 68900, 276, 25, 20, 50)
	var out, errb bytes.Buffer
	if code := run([]string{"reduce", "--S0", "20", "--L0", "50", path}, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	for _, want := range []string{"Rp0.2", "Rm", "E ", "flags:"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("table lacks %q:\n%s", want, out.String())
		}
	}
}

func TestReduceCommandUsage(t *testing.T) {
	path := writeRambergOsgood(t, 68900, 276, 25, 20, 50)
	cases := [][]string{
		{"reduce"},
		{"reduce", path}, // no geometry
		{"reduce", path, "--shape", "round", "--L0", "50"},      // no d0
		{"reduce", path, "--S0", "20"},                          // no gauge length
		{"reduce", path, path, "--S0", "20", "--L0", "50"},      // two files
		{"reduce", path, "--S0", "20", "--L0", "50", "--bogus"}, // unknown flag
		{"reduce", path, "--S0", "20", "--L0", "50", "--proof", "0.2,x"},
		{"reduce", path, "--S0", "20", "--L0", "50", "--nk-range", "20-10"},
	}
	for _, args := range cases {
		var out, errb bytes.Buffer
		if code := run(args, &out, &errb); code != 2 {
			t.Errorf("%v: exit %d, want 2 (usage); %s", args[1:], code, errb.String())
		}
	}
	var out, errb bytes.Buffer
	if code := run([]string{"reduce", filepath.Join(t.TempDir(), "none.csv"), "--S0", "20", "--L0", "50"}, &out, &errb); code != 1 {
		t.Errorf("missing file: exit %d, want 1", code)
	}
}

func TestPlotCommand(t *testing.T) {
	path := writeRambergOsgood(t, 68900, 276, 25, 20, 50)
	dir := t.TempDir()
	for ext, magic := range map[string]string{".png": "\x89PNG", ".svg": "<?xml"} {
		outPath := filepath.Join(dir, "curve"+ext)
		var out, errb bytes.Buffer
		if code := run([]string{"plot", path, "-o", outPath, "--S0", "20", "--L0", "50"}, &out, &errb); code != 0 {
			t.Fatalf("exit %d: %s", code, errb.String())
		}
		b, err := os.ReadFile(outPath)
		if err != nil || !bytes.HasPrefix(b, []byte(magic)) {
			t.Errorf("%s: not a %s file (%v)", outPath, ext, err)
		}
	}
	var out, errb bytes.Buffer
	if code := run([]string{"plot", "T-000123", "-o", filepath.Join(dir, "x.png"), "--S0", "20", "--L0", "50"}, &out, &errb); code == 0 ||
		!strings.Contains(errb.String(), "--state DIR") {
		t.Errorf("stored test id without a state dir: exit %d, %q", code, errb.String())
	}
	if code := run([]string{"plot", path, "-o", filepath.Join(dir, "x.pdf"), "--S0", "20", "--L0", "50"}, &out, &errb); code != 2 {
		t.Errorf("pdf output: exit %d, want 2", code)
	}
}
