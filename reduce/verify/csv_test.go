package verify

import (
	"encoding/json"
	"errors"
	"strings"
	"testing"
)

func TestReadReadings(t *testing.T) {
	in := "\ufeffseries,reference_N,indicated_N\n" +
		"1,1000,1002.5\n" +
		"\n" +
		"2, 1000 ,1001\n" +
		"3,1000,999.5\n" +
		"r,1000,1003\n" +
		"R,2000,2001\n"
	got, err := ReadReadings(strings.NewReader(in))
	if err != nil {
		t.Fatal(err)
	}
	want := []Reading{
		{Series1, 1000, 1002.5}, {Series2, 1000, 1001}, {Series3, 1000, 999.5},
		{Decreasing, 1000, 1003}, {Decreasing, 2000, 2001},
	}
	if len(got) != len(want) {
		t.Fatalf("got %d readings, want %d: %+v", len(got), len(want), got)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("reading %d = %+v, want %+v", i, got[i], want[i])
		}
	}
}

func TestReadReadingsErrors(t *testing.T) {
	const h = "series,reference_N,indicated_N\n"
	cases := []struct {
		name, in string
		want     error
		line     string
	}{
		{"empty", "", ErrBadHeader, ""},
		{"header only", h, ErrNoReadings, ""},
		{"wrong header", "series,force,indicated\n1,2,3\n", ErrBadHeader, "line 1"},
		{"curve file", "time_s,force_N,extension_mm,crosshead_mm\n0,1,2,3\n", ErrBadHeader, "line 1"},
		{"series 4", h + "1,10,10\n4,10,10\n", ErrBadSeries, "line 3"},
		{"empty series", h + ",10,10\n", ErrBadSeries, "line 2"},
		{"text force", h + "1,ten,10\n", ErrBadNumber, "line 2"},
		{"empty indicated", h + "1,10,\n", ErrBadNumber, "line 2"},
		{"NaN", h + "1,10,NaN\n", ErrBadNumber, "line 2"},
		{"Inf", h + "1,Inf,10\n", ErrBadNumber, "line 2"},
		{"zero reference", h + "1,0,10\n", ErrBadNumber, "line 2"},
		{"negative reference", h + "1,-10,10\n", ErrBadNumber, "line 2"},
		{"too few fields", h + "1,10,10\n2,10\n", ErrBadLine, "line 3"},
		{"too many fields", h + "1,10,10,4\n", ErrBadLine, "line 2"},
		{"bad quote", h + "1,\"10,10\n", ErrBadLine, "line 2"},
	}
	for _, c := range cases {
		_, err := ReadReadings(strings.NewReader(c.in))
		if !errors.Is(err, c.want) {
			t.Errorf("%s: err = %v, want %v", c.name, err, c.want)
			continue
		}
		if c.line != "" && !strings.Contains(err.Error(), c.line+":") {
			t.Errorf("%s: err %q does not name %s", c.name, err, c.line)
		}
	}
}

// FuzzReadReadings: any input gives readings that ClassifyForce accepts or
// a named error, never a panic.
func FuzzReadReadings(f *testing.F) {
	const h = "series,reference_N,indicated_N\n"
	for _, s := range []string{
		"",
		h,
		h + "1,1000,1002\n2,1000,1001\n3,1000,999\nr,1000,1003\n",
		h + "1,1e308,1e308\n3,1e-308,-1e308\n",
		h + "1,1e-300,1e300\n",
		h + "r,5,5\n",
		h + "1,\"1000\",\"1\n002\"\n",
		"\ufeff" + h + "R, 7 , 7\n\n\n",
		h + "1,10,10\n1,10,11\n",
		"a,b\n1,2\n",
		h + "1,0x10,1_0\n",
	} {
		f.Add(s)
	}
	named := []error{ErrBadHeader, ErrBadLine, ErrBadSeries, ErrBadNumber, ErrNoReadings}
	f.Fuzz(func(t *testing.T, in string) {
		rd, err := ReadReadings(strings.NewReader(in))
		if err != nil {
			for _, e := range named {
				if errors.Is(err, e) {
					return
				}
			}
			t.Fatalf("unnamed error %v", err)
		}
		if len(rd) == 0 {
			t.Fatal("no error and no readings")
		}
		rep, err := ClassifyForce(rd, 1, 0)
		if err != nil {
			if !errors.Is(err, ErrDuplicate) && !errors.Is(err, ErrBadNumber) {
				t.Fatalf("parsed readings rejected with an unnamed error: %v", err)
			}
			return
		}
		if len(rep.Ranges) != len(rep.Points) {
			t.Fatalf("%d ranges for %d points", len(rep.Ranges), len(rep.Points))
		}
		if _, err := json.Marshal(rep); err != nil {
			t.Fatalf("report cannot be written: %v", err)
		}
	})
}
