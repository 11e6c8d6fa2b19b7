package curvefile

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"framed/reduce"
)

func TestReadGood(t *testing.T) {
	in := "\xef\xbb\xbftime_s,force_N,extension_mm,crosshead_mm\r\n" +
		"0,1.5,,0\r\n" +
		"0.1, 2.5 ,0.001,0.01\r\n" +
		"\r\n" +
		"0.1,3e2,0.002,-0.02" // equal time stamps, no final newline
	c, err := Read(strings.NewReader(in))
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != 3 || c.ForceN[2] != 300 || c.CrossheadMM[2] != -0.02 || c.ForceN[1] != 2.5 {
		t.Fatalf("got %+v", c)
	}
	if !math.IsNaN(c.ExtensionMM[0]) || c.ExtensionMM[1] != 0.001 {
		t.Errorf("empty cell must be NaN: %v", c.ExtensionMM)
	}
}

func TestReadDropsChannelNeverRead(t *testing.T) {
	c, err := Read(strings.NewReader(Header + "\n0,1,,\n1,2,,\n"))
	if err != nil {
		t.Fatal(err)
	}
	if c.ExtensionMM != nil || c.CrossheadMM != nil || len(c.ForceN) != 2 {
		t.Errorf("columns never read should be nil: %+v", c)
	}
}

func TestReadErrors(t *testing.T) {
	long := Header + "\n0,1,2," + strings.Repeat("1", MaxLineBytes) + "\n"
	cases := []struct {
		name, in string
		want     error
		line     string
	}{
		{"empty", "", ErrHeader, ""},
		{"wrong header", "t,F,x,c\n0,1,2,3\n", ErrHeader, "line 1"},
		{"bad number", Header + "\n0,1,2,3\n1,abc,2,3\n", ErrNumber, "line 3"},
		{"nan text", Header + "\n0,NaN,2,3\n", ErrNumber, "line 2"},
		{"inf text", Header + "\n0,1,+Inf,3\n", ErrNumber, "line 2"},
		{"too few", Header + "\n0,1,2\n", ErrColumns, "line 2"},
		{"too many", Header + "\n0,1,2,3,4\n", ErrColumns, "line 2"},
		{"time backwards", Header + "\n1,1,2,3\n0.5,1,2,3\n", ErrTime, "line 3"},
		{"no time", Header + "\n,1,2,3\n", ErrTime, "line 2"},
		{"huge line", long, ErrLineTooLong, "line 2"},
	}
	for _, tc := range cases {
		_, err := Read(strings.NewReader(tc.in))
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: err %v, want %v", tc.name, err, tc.want)
			continue
		}
		if !strings.Contains(err.Error(), tc.line) {
			t.Errorf("%s: %q does not name %q", tc.name, err, tc.line)
		}
	}
}

type failingReader struct{}

func (failingReader) Read([]byte) (int, error) { return 0, errors.New("disk gone") }

func TestReadReaderError(t *testing.T) {
	if _, err := Read(failingReader{}); !errors.Is(err, ErrRead) {
		t.Errorf("err %v, want ErrRead", err)
	}
}

func TestWriteReadRoundTrip(t *testing.T) {
	nan := math.NaN()
	c := reduce.Curve{
		TimeS:       []float64{0, 0.1, 0.2},
		ForceN:      []float64{0.1 + 0.2, 1e-300, 12345.678901234567},
		ExtensionMM: []float64{0, nan, 1.0 / 3},
		CrossheadMM: []float64{-0, 2, 3},
	}
	var b bytes.Buffer
	if err := Write(&b, c); err != nil {
		t.Fatal(err)
	}
	got, err := Read(&b)
	if err != nil {
		t.Fatal(err)
	}
	for i := range c.TimeS {
		for k, pair := range [][2][]float64{{c.TimeS, got.TimeS}, {c.ForceN, got.ForceN}, {c.ExtensionMM, got.ExtensionMM}, {c.CrossheadMM, got.CrossheadMM}} {
			a, b := pair[0][i], pair[1][i]
			if !(a == b || math.IsNaN(a) && math.IsNaN(b)) {
				t.Errorf("column %d row %d: wrote %v read %v", k, i, a, b)
			}
		}
	}
	if err := Write(&b, reduce.Curve{TimeS: []float64{0}, ForceN: []float64{1, 2}}); !errors.Is(err, reduce.ErrRaggedCurve) {
		t.Errorf("ragged write: %v", err)
	}
}

// FuzzRead: any input gives a curve or an error, never a panic, and a curve
// read is written and read back to the same values.
func FuzzRead(f *testing.F) {
	f.Add([]byte(Header + "\n0,1,2,3\n0.1,2,,4\n"))
	f.Add([]byte(Header + "\r\n0,1,2,3\r\n"))
	f.Add([]byte("t,F\n"))
	f.Add([]byte(Header + "\n0,1e400,2,3\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := Read(bytes.NewReader(data))
		if err != nil {
			return
		}
		var b bytes.Buffer
		if err := Write(&b, c); err != nil {
			t.Fatalf("write of a curve just read: %v", err)
		}
		c2, err := Read(&b)
		if err != nil {
			t.Fatalf("read back: %v", err)
		}
		if c2.Len() != c.Len() {
			t.Fatalf("read back %d rows, wrote %d", c2.Len(), c.Len())
		}
	})
}
