package lineserial

import (
	"errors"
	"math"
	"testing"
)

func TestXorChecksumMatchesPublishedSentences(t *testing.T) {
	// The NMEA 0183 checksum is the same XOR over the bytes before '*'.
	// These two sentences and their checksums are the widely reproduced
	// examples of NMEA 0183 documentation (from memory).
	cases := []struct {
		body string
		want byte
	}{
		{"GPGGA,123519,4807.038,N,01131.000,E,1,08,0.9,545.4,M,46.9,M,,", 0x47},
		{"GPRMC,123519,A,4807.038,N,01131.000,E,022.4,084.4,230394,003.1,W", 0x6A},
	}
	for _, c := range cases {
		if got := xorSum([]byte(c.body)); got != c.want {
			t.Errorf("xor(%q) = %02X, want %02X", c.body, got, c.want)
		}
		line := AppendChecksum([]byte(c.body))
		if body, err := splitChecksum(line); err != nil || string(body) != c.body {
			t.Errorf("splitChecksum(%q) = %q, %v", line, body, err)
		}
	}
	for _, bad := range []string{"t=1*", "t=1*4", "t=1*GG", "t=1", "*", ""} {
		if _, err := splitChecksum([]byte(bad)); !errors.Is(err, ErrChecksum) {
			t.Errorf("splitChecksum(%q) = %v, want ErrChecksum", bad, err)
		}
	}
}

func mustParser(t testing.TB, config string) *Parser {
	t.Helper()
	c, err := ParseConfig([]byte(config))
	if err != nil {
		t.Fatal(err)
	}
	return NewParser(c)
}

const kvConfig = `{"port":"p","format":"keyvalue","time_field":"t","channels":[
 {"name":"force","field":"f","quantity":"force","unit":"counts"},
 {"name":"x","field":"x","quantity":"crosshead","unit":"counts","raw_bits":32}]}`

func TestParseKeyValue(t *testing.T) {
	p := mustParser(t, kvConfig)
	var s Sample
	cases := []struct {
		line        string
		err         error
		f, x        float64
		nan, range_ int
	}{
		{line: "t=5 f=-8388 x=10234", f: -8388, x: 10234},
		{line: "x=1 t=5 f=2", f: 2, x: 1},               // any key order
		{line: "  t=5   f=2  x=1  ", f: 2, x: 1},        // runs of spaces
		{line: "t=5 f=2 x=1 temp=21.5", f: 2, x: 1},     // unknown key skipped
		{line: "t=5 f=-8388608 x=1", f: -8388608, x: 1}, // 24-bit minimum
		{line: "t=5 f=8388608 x=1", f: math.NaN(), x: 1, range_: 1},
		{line: "t=5 f=NaN x=nan", f: math.NaN(), x: math.NaN(), nan: 2},
		{line: "t=5 f=2", err: ErrGarbled},
		{line: "t=5 f=2 x=1 f=3", err: ErrGarbled},
		{line: "t=5 f=2 x", err: ErrGarbled},
		{line: "t=5 f=2 =1 x=1", err: ErrGarbled},
		{line: "t=-5 f=2 x=1", err: ErrGarbled},
		{line: "t=4294967296 f=2 x=1", err: ErrGarbled}, // past a 32-bit counter
		{line: "t=5 f=2.5.1 x=1", err: ErrGarbled},
		{line: "", err: ErrGarbled},
	}
	for _, c := range cases {
		err := p.Parse([]byte(c.line), &s)
		if !errors.Is(err, c.err) || (c.err == nil) != (err == nil) {
			t.Errorf("%q: err %v, want %v", c.line, err, c.err)
			continue
		}
		if err != nil {
			continue
		}
		if !same(s.Values[0], c.f) || !same(s.Values[1], c.x) || s.NaNs != c.nan || s.OutOfRange != c.range_ {
			t.Errorf("%q: got %v nan=%d oor=%d, want [%v %v] nan=%d oor=%d", c.line, s.Values, s.NaNs, s.OutOfRange, c.f, c.x, c.nan, c.range_)
		}
		if !s.HasBoardTime || s.BoardTime != 5 {
			t.Errorf("%q: board time %v %d", c.line, s.HasBoardTime, s.BoardTime)
		}
	}
}

func same(a, b float64) bool { return a == b || math.IsNaN(a) && math.IsNaN(b) }

func TestParseDelimitedHostTime(t *testing.T) {
	p := mustParser(t, `{"port":"p","format":"delimited","delimiter":";","fields":["_","f"],"channels":[
	 {"name":"force","field":"f","quantity":"force","unit":"N","raw_bits":0,"scale":0.5,"offset":-1}]}`)
	var s Sample
	if err := p.Parse([]byte("status;10\r"), &s); err != nil {
		t.Fatal(err)
	}
	// value = raw*scale + offset = 10*0.5 - 1.
	if s.Values[0] != 4 || s.HasBoardTime {
		t.Errorf("got %v board time %v, want 4 and host time", s.Values, s.HasBoardTime)
	}
	for _, bad := range []string{"10", "a;10;", ";", "a;", "a;1e", "a;--1", "a;1_000", "a;0x1F", "a;Inf"} {
		if err := p.Parse([]byte(bad), &s); !errors.Is(err, ErrGarbled) {
			t.Errorf("%q: %v, want ErrGarbled", bad, err)
		}
	}
}

func TestParseNumberAgreesWithDecimalMeaning(t *testing.T) {
	cases := map[string]float64{
		"0": 0, "-0": 0, "+7": 7, "8388607": 8388607, "-8388608": -8388608,
		"12.5": 12.5, "-1e3": -1000, "1.5E-2": 0.015, "123456789012345678": 123456789012345678,
		"1234567890123456789012": 1.234567890123456789012e21,
	}
	for in, want := range cases {
		if v, k := parseNumber([]byte(in)); k != numOK || v != want {
			t.Errorf("parseNumber(%q) = %v, %v; want %v", in, v, k, want)
		}
	}
	if v, k := parseNumber([]byte("1e400")); k != numOK || !math.IsInf(v, 1) {
		t.Errorf("1e400: %v %v, want +Inf for the range check", v, k)
	}
	if _, ok := parseUint([]byte("18446744073709551616")); ok {
		t.Error("2^64 accepted as a uint64 counter")
	}
	if v, ok := parseUint([]byte("18446744073709551615")); !ok || v != math.MaxUint64 {
		t.Errorf("2^64-1: %v %v", v, ok)
	}
}

func TestBoardClockWraps(t *testing.T) {
	// A 32-bit micros() counter wraps after 2^32 us = 4294.967296 s.
	c := newBoardClock(32, "us")
	host := int64(1_700_000_000_000_000_000)
	t0, _ := c.toHost(4294967000, host)
	t1, _ := c.toHost(200, host+999) // 496 us later, across the wrap
	if t0 != host || t1-t0 != 496_000 {
		t.Errorf("across wrap: %d ns, want 496000", t1-t0)
	}
	// Many wraps at 1 kHz never lose a tick.
	c = newBoardClock(16, "ms")
	raw := uint64(0)
	first, _ := c.toHost(raw, host)
	var last int64
	for i := 1; i <= 200000; i++ {
		raw = (raw + 1) & 0xFFFF
		last, _ = c.toHost(raw, 0)
	}
	if last-first != 200000*1_000_000 {
		t.Errorf("after 200000 ms of 16-bit wraps: %d ns", last-first)
	}
	// A big step back is a board restart: re-anchor on host time.
	got, re := c.toHost(3, host+5)
	if !re || got != host+5 {
		t.Errorf("restart: %d %v", got, re)
	}
}

func TestAssemblerBoundsLines(t *testing.T) {
	a := newAssembler(16)
	var lines []string
	over := 0
	feed := func(s string) {
		a.feed([]byte(s), func(b []byte) { lines = append(lines, string(b)) }, func() { over++ })
	}
	feed("ab")
	feed("c\nde")
	feed("f\n0123456789abcdefXYZ")
	feed("more\nok\n")
	feed("0123456789abcdef\n") // exactly 16: fits
	feed("0123456789abcdefg\n")
	want := []string{"abc", "def", "ok", "0123456789abcdef"}
	if len(lines) != len(want) || over != 2 {
		t.Fatalf("lines %q overlong %d, want %q and 2", lines, over, want)
	}
	for i := range want {
		if lines[i] != want[i] {
			t.Errorf("line %d %q, want %q", i, lines[i], want[i])
		}
	}
	feed("partial")
	if !a.reset() || a.reset() {
		t.Error("reset does not report the dropped partial line once")
	}
}
