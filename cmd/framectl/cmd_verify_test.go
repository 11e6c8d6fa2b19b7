package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"net"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"framed/daemon"
	"framed/reduce/verify"
)

// The golden cases in testdata/verify are worked by hand from the
// ISO 7500-1 and ISO 9513 definitions (each folder's NOTES.md shows the
// arithmetic). Here they run through the command line, --json.
func TestVerifyGoldenCLI(t *testing.T) {
	dirs, err := filepath.Glob("../../testdata/verify/*")
	if err != nil || len(dirs) == 0 {
		t.Fatalf("no golden cases: %v", err)
	}
	for _, dir := range dirs {
		if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
			continue // README.md
		}
		t.Run(filepath.Base(dir), func(t *testing.T) {
			argsB, err := os.ReadFile(filepath.Join(dir, "args"))
			if err != nil {
				t.Fatal(err)
			}
			args := append([]string{"verify", "--readings", filepath.Join(dir, "readings.csv"), "--json"}, strings.Fields(string(argsB))...)
			var stdout, stderr bytes.Buffer
			code := run(args, &stdout, &stderr)
			if wantErr, e := os.ReadFile(filepath.Join(dir, "expected-error")); e == nil {
				if code != 1 || !strings.Contains(stderr.String(), strings.TrimSpace(string(wantErr))) {
					t.Fatalf("exit %d, stderr %q; want 1 and %q", code, stderr.String(), wantErr)
				}
				return
			}
			if code != 0 {
				t.Fatalf("exit %d: %s", code, stderr.String())
			}
			wantB, err := os.ReadFile(filepath.Join(dir, "expected.json"))
			if err != nil {
				t.Fatal(err)
			}
			var want, got any
			if err := json.Unmarshal(wantB, &want); err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(stdout.Bytes(), &got); err != nil {
				t.Fatalf("output is not JSON: %v\n%s", err, stdout.String())
			}
			if d := jsonSubsetDiff("", want, got); len(d) > 0 {
				t.Errorf("differs from expected.json:\n%s", strings.Join(d, "\n"))
			}
		})
	}
}

// jsonSubsetDiff: objects in want need only their own keys in got, arrays
// match in length, numbers to 1e-9 relative.
func jsonSubsetDiff(path string, want, got any) []string {
	switch w := want.(type) {
	case map[string]any:
		g, ok := got.(map[string]any)
		if !ok {
			return []string{path + ": not an object"}
		}
		var out []string
		for k, wv := range w {
			gv, ok := g[k]
			if !ok {
				out = append(out, path+"."+k+": missing")
				continue
			}
			out = append(out, jsonSubsetDiff(path+"."+k, wv, gv)...)
		}
		return out
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			return []string{fmt.Sprintf("%s: got %v, want %d elements", path, got, len(w))}
		}
		var out []string
		for i := range w {
			out = append(out, jsonSubsetDiff(fmt.Sprintf("%s[%d]", path, i), w[i], g[i])...)
		}
		return out
	case float64:
		g, ok := got.(float64)
		if !ok || math.Abs(g-w) > 1e-9*math.Max(1, math.Abs(w)) {
			return []string{fmt.Sprintf("%s: got %v, want %v", path, got, w)}
		}
		return nil
	}
	if want != got {
		return []string{fmt.Sprintf("%s: got %v, want %v", path, got, want)}
	}
	return nil
}

func TestVerifyTextReport(t *testing.T) {
	var stdout, stderr bytes.Buffer
	code := run([]string{"verify", "--readings", "../../testdata/verify/boundary-and-f0/readings.csv",
		"--resolution-N", "2", "--zero-after-N", "-4"}, &stdout, &stderr)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	out := stdout.String()
	// Values from testdata/verify/boundary-and-f0/NOTES.md (by hand).
	for _, want := range []string{
		"1000    +1.000     0.400         -     0.200  1    ",
		"5000    +0.000     0.200    +0.900     0.040  1",
		"f0 -0.080 % (class 1)",
		"1000 N to 5000 N   2",
		"ASTM E4 accuracy (|q| <= 1 %): FAIL",
		"from memory",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q:\n%s", want, out)
		}
	}
}

func TestVerifyFluctuation(t *testing.T) {
	// Indicator steps 0.5 N but wanders over 3 N unloaded: r = 3/2 + 0.5 =
	// 2 N (ISO 7500-1 rule, from memory), so a at 1000 N = 100 x 2 / 1000
	// = 0.2 % (by hand).
	var stdout, stderr bytes.Buffer
	code := run([]string{"verify", "--readings", "../../testdata/verify/boundary-and-f0/readings.csv",
		"--resolution-N", "0.5", "--fluctuation-N", "3", "--zero-after-N", "0", "--json"}, &stdout, &stderr)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	var rep verify.ForceReport
	if err := json.Unmarshal(stdout.Bytes(), &rep); err != nil {
		t.Fatal(err)
	}
	if rep.ResolutionN != 2 || math.Abs(rep.Points[0].APct-0.2) > 1e-12 {
		t.Errorf("resolution %v, a at 1000 N %v", rep.ResolutionN, rep.Points[0].APct)
	}
}

func TestVerifyUsage(t *testing.T) {
	t.Setenv("FRAMED_STATE", "")
	csv := "../../testdata/verify/class05-five-forces/readings.csv"
	cases := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"verify", "--readings", csv, "--zero-after-N", "0"}, 2, "--resolution-N is required"},
		{[]string{"verify", "--readings", csv, "--resolution-N", "1"}, 2, "--zero-after-N is required"},
		{[]string{"verify", "--extensometer", "--resolution-mm", "0.001"}, 2, "needs --readings"},
		{[]string{"verify", "--readings", csv, "--resolution-N", "1", "--zero-after-N", "0", "extra"}, 2, "unexpected argument"},
		{[]string{"verify", "--readings", csv, "--resolution-N", "1", "--zero-after-N", "0", "--forces", "5"}, 2, "--forces is for a guided"},
		{[]string{"verify", "--resolution-N", "1"}, 1, "use --readings FILE.csv, or start framed"},
		{[]string{"verify", "--resolution-N", "1", "--state", t.TempDir()}, 1, "no answer on"},
		{[]string{"verify", "--readings", "no-such.csv", "--resolution-N", "1", "--zero-after-N", "0"}, 1, "no-such.csv"},
		{[]string{"verify", "--readings", csv, "--resolution-N", "-1", "--zero-after-N", "0"}, 1, "bad resolution"},
	}
	for _, c := range cases {
		var stdout, stderr bytes.Buffer
		code := run(c.args, &stdout, &stderr)
		if code != c.code || !strings.Contains(stderr.String(), c.want) {
			t.Errorf("%q: exit %d stderr %q; want %d and %q", c.args, code, stderr.String(), c.code, c.want)
		}
	}
}

func rdg(s verify.Series, refN, indN float64) verify.Reading {
	return verify.Reading{Series: s, ReferenceN: refN, IndicatedN: indN}
}

// scripted is a forceReader playing back a fixed list of forces; it fails
// the test if the guided flow asks for more or fewer.
type scripted struct {
	t      *testing.T
	forces []float64
}

func (s *scripted) Read(ctx context.Context) (float64, error) {
	if len(s.forces) == 0 {
		s.t.Error("guided flow read more forces than scripted")
		return 0, errors.New("script exhausted")
	}
	f := s.forces[0]
	s.forces = s.forces[1:]
	return f, nil
}

func TestGuidedForce(t *testing.T) {
	// The frame of the worked example in reduce/verify: 10 kN read 10030,
	// 10040, 10020 N and 10050 N on the way down; 5 kN read 5010, 5000,
	// 4990 and 5000 down; 1 N after unloading.
	src := &scripted{t: t, forces: []float64{
		5010, 10030, // series 1
		5000, 10040, // series 2
		4990, 10020, // series 3
		10050, 5000, // decreasing
		1, // zero
	}}
	in := strings.NewReader(strings.Repeat("\n", 10)) // preload + 8 readings + unload
	var out bytes.Buffer
	g, err := guidedForce(context.Background(), src, in, &out, []float64{5000, 10000}, true)
	if err != nil {
		t.Fatal(err)
	}
	if len(src.forces) != 0 {
		t.Errorf("%d scripted forces unread", len(src.forces))
	}
	want := []verify.Reading{
		rdg(verify.Series1, 5000, 5010), rdg(verify.Series1, 10000, 10030),
		rdg(verify.Series2, 5000, 5000), rdg(verify.Series2, 10000, 10040),
		rdg(verify.Series3, 5000, 4990), rdg(verify.Series3, 10000, 10020),
		rdg(verify.Decreasing, 10000, 10050), rdg(verify.Decreasing, 5000, 5000),
	}
	if len(g.Readings) != len(want) || g.ZeroAfterN != 1 {
		t.Fatalf("got %+v zero %v", g.Readings, g.ZeroAfterN)
	}
	for i := range want {
		if g.Readings[i] != want[i] {
			t.Errorf("reading %d = %+v, want %+v", i, g.Readings[i], want[i])
		}
	}
	if !strings.Contains(out.String(), "preload three times to 10000 N") {
		t.Errorf("no preload prompt:\n%s", out.String())
	}
	// q at 10 kN = +0.3 %, v = +0.3 % (by hand, see reduce/verify).
	rep, err := verify.ClassifyForce(g.Readings, 1, g.ZeroAfterN)
	if err != nil {
		t.Fatal(err)
	}
	if q := *rep.Points[1].QPct; math.Abs(q-0.3) > 1e-9 {
		t.Errorf("q at 10 kN = %v", q)
	}

	// The operator stops after the preload; input ending early also stops.
	for _, input := range []string{"\nq\n", "\n\n"} {
		src := &scripted{t: t, forces: []float64{5010, 10030}}
		_, err := guidedForce(context.Background(), src, strings.NewReader(input), &out, []float64{5000, 10000}, true)
		if err == nil || !strings.Contains(err.Error(), "stopped") {
			t.Errorf("input %q: err %v", input, err)
		}
	}
}

// TestVerifyGuidedOverSocketIntegration runs the guided command against a
// stand-in control socket that answers the daemon's line protocol.
func TestVerifyGuidedOverSocketIntegration(t *testing.T) {
	dir, err := os.MkdirTemp("", "fv") // short path: unix socket names are limited
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(dir) })
	ln, err := net.Listen("unix", filepath.Join(dir, daemon.ControlSocketName))
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	// Each series reads 1 % high at 1000 N: q = +1.0 % (class 1 by the
	// ISO 7500-1 table, from memory); then 0.5 N after unloading. The
	// stand-in answers one request per connection, as daemon.Call sends
	// them.
	answers := []string{"1010", "1010", "1010", "1005", "0.5"}
	stored := make(chan []byte, 1)
	go func() {
		for {
			c, err := ln.Accept()
			if err != nil {
				return
			}
			line, err := bufio.NewReader(c).ReadBytes('\n')
			var req struct {
				Op          string          `json:"op"`
				Calibration json.RawMessage `json:"calibration"`
			}
			if err == nil && json.Unmarshal(line, &req) == nil {
				switch {
				case req.Op == "verification":
					stored <- req.Calibration
					fmt.Fprintln(c, `{"ok":true,"data":{}}`)
				case req.Op == "status":
					fmt.Fprintln(c, `{"ok":true,"data":{"state":"idle"}}`)
				case req.Op == "read" && len(answers) > 0:
					fmt.Fprintf(c, `{"ok":true,"data":{"raw_mean":1,"raw_sd":0,"samples":200,"calibrated_mean":%s}}`+"\n", answers[0])
					answers = answers[1:]
				default:
					fmt.Fprintln(c, `{"ok":false,"error":"unexpected request"}`)
				}
			}
			c.Close()
		}
	}()
	old := verifyStdin
	verifyStdin = strings.NewReader(strings.Repeat("\n", 7))
	t.Cleanup(func() { verifyStdin = old })
	var stdout, stderr bytes.Buffer
	code := run([]string{"verify", "--forces", "1000", "--resolution-N", "1", "--state", dir, "--json"}, &stdout, &stderr)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	var rep verify.ForceReport
	if err := json.Unmarshal(stdout.Bytes(), &rep); err != nil {
		t.Fatal(err)
	}
	// v = 100 (1005 - 1010) / 1000 = -0.5 %; f0 = 100 x 0.5 / 1000 = 0.05 %.
	if p := rep.Points[0]; p.Class != verify.Class1 || math.Abs(*p.QPct-1) > 1e-9 || math.Abs(*p.VPct+0.5) > 1e-9 || math.Abs(rep.F0Pct-0.05) > 1e-9 {
		t.Errorf("report %+v", rep)
	}
	// A guided verification hands its report to framed to store and publish.
	select {
	case b := <-stored:
		var got verify.ForceReport
		if err := json.Unmarshal(b, &got); err != nil || len(got.Points) != 1 || got.Points[0].Class != verify.Class1 {
			t.Errorf("stored report %s (%v)", b, err)
		}
	default:
		t.Errorf("the guided verification's report was not handed to framed")
	}
}
