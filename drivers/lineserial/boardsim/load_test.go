package boardsim

import (
	"context"
	"errors"
	"io"
	"math"
	"strings"
	"testing"
	"time"
)

func TestParseLoad(t *testing.T) {
	g := StandardGravity // 9.80665 m/s2, 3rd CGPM (1901)
	cases := []struct {
		in   string
		want float64
	}{
		{"12.5", 12.5 * 9.80665},
		{"10kg", 98.0665},
		{" 10 KG ", 98.0665},
		{"122.6N", 122.6},
		{"-50n", -50},
		{"0", 0},
		{"off", 0},
		{"unload", 0},
	}
	for _, c := range cases {
		got, err := ParseLoad(c.in, g)
		if err != nil || math.Abs(got-c.want) > 1e-9 {
			t.Errorf("ParseLoad(%q) = %v, %v; want %v", c.in, got, err, c.want)
		}
	}
	for _, in := range []string{"", "ten", "5 lb", "NaN", "inf", "-3", "1e999"} {
		if _, err := ParseLoad(in, g); !errors.Is(err, ErrBadLoad) {
			t.Errorf("ParseLoad(%q): %v, want ErrBadLoad", in, err)
		}
	}
}

func TestParseScript(t *testing.T) {
	steps, err := ParseScript("0:5s, 10:250ms,122.6N:1m", 9.81)
	if err != nil {
		t.Fatal(err)
	}
	want := []Step{{0, 5 * time.Second}, {98.1, 250 * time.Millisecond}, {122.6, time.Minute}}
	if len(steps) != len(want) {
		t.Fatalf("%d steps, want %d", len(steps), len(want))
	}
	for i := range want {
		if math.Abs(steps[i].ForceN-want[i].ForceN) > 1e-9 || steps[i].Hold != want[i].Hold {
			t.Errorf("step %d = %+v, want %+v", i, steps[i], want[i])
		}
	}
	for _, in := range []string{"", "10", "10:", "10:-1s", "x:1s", "10:5", "0:1s,,1:1s"} {
		if _, err := ParseScript(in, 9.81); !errors.Is(err, ErrBadScript) {
			t.Errorf("ParseScript(%q): %v, want ErrBadScript", in, err)
		}
	}
}

func TestPlayLeavesLastLoad(t *testing.T) {
	var l Load
	if err := l.Play(context.Background(), []Step{{10, time.Millisecond}, {20, time.Millisecond}}); err != nil {
		t.Fatal(err)
	}
	if got := l.ForceN(); got != 20 {
		t.Errorf("after the script %v N hung, want 20", got)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if err := l.Play(ctx, []Step{{30, time.Hour}}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled Play: %v", err)
	}
}

func TestControl(t *testing.T) {
	var l Load
	var out strings.Builder
	err := l.Control(strings.NewReader("10\n\nbanana\n5N\nq\n20\n"), &out, 10)
	if err != nil {
		t.Fatalf("Control: %v", err)
	}
	if got := l.ForceN(); got != 5 {
		t.Errorf("after 10 kg, a bad line and 5N: %v N hung, want 5 (the line after q is not read)", got)
	}
	if !strings.Contains(out.String(), "hung 100 N") || !strings.Contains(out.String(), `"banana"`) {
		t.Errorf("echo %q: want the hung load and the refused line quoted", out.String())
	}
	if err := l.Control(strings.NewReader("3\n"), io.Discard, 10); !errors.Is(err, io.EOF) {
		t.Errorf("Control at end of input: %v, want io.EOF", err)
	}
}
