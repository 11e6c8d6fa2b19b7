package lineserial

import (
	"math"
	"testing"
)

// FuzzParseLine feeds arbitrary lines to the keyvalue+checksum and the
// delimited parsers: no panic, and every accepted sample is either a
// finite value inside the configured range or NaN counted as such.
func FuzzParseLine(f *testing.F) {
	for _, s := range []string{
		"t=1000000 f=-8388 x=10234*74", "123456,-8388,10234", "t=1 f=nan x=1",
		"t=1 f=8388608 x=1", "\x00\xff*00", "t=4294967295 f=1 x=2 temp=3", ",,,", "1e400,1,1",
	} {
		f.Add([]byte(s))
	}
	kv := mustParser(f, `{"port":"p","format":"keyvalue","time_field":"t","checksum":"xor","channels":[
	 {"name":"force","field":"f","quantity":"force","unit":"counts"},
	 {"name":"x","field":"x","quantity":"crosshead","unit":"mm","raw_bits":32,"scale":0.0025}]}`)
	dl := mustParser(f, `{"port":"p","format":"delimited","fields":["t","f","x"],"time_field":"t","channels":[
	 {"name":"force","field":"f","quantity":"force","unit":"counts"},
	 {"name":"x","field":"x","quantity":"crosshead","unit":"counts","raw_bits":32}]}`)
	f.Fuzz(func(t *testing.T, line []byte) {
		for _, p := range []*Parser{kv, dl} {
			var s Sample
			if err := p.Parse(line, &s); err != nil {
				continue
			}
			nan := 0
			for i, v := range s.Values {
				if math.IsNaN(v) {
					nan++
					continue
				}
				lo, hi := p.chans[i].lo, p.chans[i].hi
				raw := (v - p.chans[i].offset) / p.chans[i].scale
				if math.IsInf(v, 0) || raw < lo-1e-6 || raw > hi+1e-6 {
					t.Fatalf("%q: channel %d value %v outside %v..%v", line, i, v, lo, hi)
				}
			}
			if nan != s.NaNs+s.OutOfRange {
				t.Fatalf("%q: %d NaN values but %d NaN + %d out of range counted", line, nan, s.NaNs, s.OutOfRange)
			}
			if !s.HasBoardTime || s.BoardTime > math.MaxUint32 {
				t.Fatalf("%q: board time %v %d", line, s.HasBoardTime, s.BoardTime)
			}
		}
	})
}
