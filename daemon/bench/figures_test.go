package bench

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
	"time"
)

// The JSON is the contract of `framectl bench --json` (design.md):
// {"figures": [{"name", "value", "unit", "limit", "ratio"}]}, ratio =
// value / limit, and a figure not measured carries null, not NaN (which
// JSON cannot hold).
func TestReportJSONContract(t *testing.T) {
	var r Report
	r.Add(Figure{Name: "ingest", Value: 3e6, Unit: "samples/s", Limit: 4e6, LimitKind: LimitMeasured})
	r.Add(Figure{Name: "latency_p99", Value: nan, Unit: "ms", Limit: 100, LimitKind: LimitTarget})
	raw, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	var got struct {
		Figures []map[string]any `json:"figures"`
	}
	if err := json.Unmarshal(raw, &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Figures) != 2 {
		t.Fatalf("%d figures in %s", len(got.Figures), raw)
	}
	for _, f := range got.Figures {
		for _, k := range []string{"name", "value", "unit", "limit", "ratio"} {
			if _, ok := f[k]; !ok {
				t.Errorf("figure %v lacks %q", f["name"], k)
			}
		}
	}
	if r := got.Figures[0]["ratio"].(float64); math.Abs(r-0.75) > 1e-12 {
		t.Errorf("ratio %v, want 3e6/4e6 = 0.75", r)
	}
	if got.Figures[1]["value"] != nil || got.Figures[1]["ratio"] != nil {
		t.Errorf("unmeasured figure %v: want null value and ratio", got.Figures[1])
	}
}

func TestWriteTableShowsEveryFigure(t *testing.T) {
	var r Report
	r.Add(Figure{Name: "cpu_1khz", Value: 2, Unit: "% of one core", Limit: 5, Pass: passIf(true)})
	r.Add(Figure{Name: "write_amplification", Value: 7.5, Limit: 3, Pass: passIf(false), Note: "why"})
	var b bytes.Buffer
	if err := r.WriteTable(&b); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{"cpu_1khz", "0.4", "yes", "write_amplification", "2.50", "NO", "write_amplification: why"} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
}

// Nearest-rank percentiles (Hyndman and Fan 1996, definition 1): of
// 1..100, p50 is 50 and p99 is 99; of four values p99 is the largest.
func TestQuantileNearestRank(t *testing.T) {
	v := make([]float64, 100)
	for i := range v {
		v[i] = float64(i + 1)
	}
	if q := quantile(v, 0.5); q != 50 {
		t.Errorf("p50 of 1..100 = %v", q)
	}
	if q := quantile(v, 0.99); q != 99 {
		t.Errorf("p99 of 1..100 = %v", q)
	}
	if q := quantile([]float64{1, 2, 3, 40}, 0.99); q != 40 {
		t.Errorf("p99 of 4 values = %v", q)
	}
	if q := quantile(nil, 0.5); !math.IsNaN(q) {
		t.Errorf("p50 of nothing = %v, want NaN", q)
	}
}

func TestPlanRefusesUnknownMode(t *testing.T) {
	if _, err := (Options{Mode: "fast"}).plan(); err == nil {
		t.Error("mode fast accepted")
	}
	for _, m := range []string{"", ModeQuick, ModeDefault, ModeLong} {
		if _, err := (Options{Mode: m}).plan(); err != nil {
			t.Errorf("mode %q: %v", m, err)
		}
	}
}

// Growth is the mean of the last fifth of the readings minus the mean of
// the first fifth: of 1..10 MB, (9.5) - (1.5) = 8 MB.
func TestRSSGrowthFromFifths(t *testing.T) {
	a := acquisition{rss: []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}}
	if g := a.rssGrowthMB(); g != 8 {
		t.Errorf("growth %v, want 8", g)
	}
	if m := a.rssMaxMB(); m != 10 {
		t.Errorf("max %v", m)
	}
	if g := (acquisition{rss: []float64{30}}).rssGrowthMB(); g != 0 {
		t.Errorf("growth of one reading %v", g)
	}
}

// The committed rate spans whole commits: from the first change of the
// count inside the stretch to the last. Commits of 1000 samples every
// 100 ms are 10 000 samples/s whatever the stretch's edges.
func TestRateOverSpansWholeCommits(t *testing.T) {
	t0 := time.Unix(1000, 0)
	var pts []point
	for i := range 30 {
		pts = append(pts, point{t0.Add(time.Duration(i)*100*time.Millisecond + 30*time.Millisecond), 1000 * (i + 1)})
	}
	if r := rateOver(pts, t0, t0.Add(3*time.Second)); math.Abs(r-10000) > 1e-6 {
		t.Errorf("rate %v, want 10000", r)
	}
	if r := rateOver(pts, t0.Add(time.Second), t0.Add(2*time.Second)); math.Abs(r-10000) > 1e-6 {
		t.Errorf("rate over the middle second %v, want 10000", r)
	}
	if r := rateOver(pts, t0.Add(time.Second), t0.Add(1100*time.Millisecond)); !math.IsNaN(r) {
		t.Errorf("rate from one change %v, want NaN", r)
	}
}
