package daemon

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Every file in testdata/config/bad/ is a configuration a technician could
// plausibly write wrong; each must be refused before any I/O with an error
// that names the problem (the first line of the file says which words the
// message must contain, after "#want:").
func TestBadConfigsAreRefusedClearly(t *testing.T) {
	files, err := filepath.Glob("../testdata/config/bad/*.json")
	if err != nil || len(files) == 0 {
		t.Fatalf("no bad configs found: %v", err)
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			data, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			want, body, _ := strings.Cut(string(data), "\n")
			want = strings.TrimPrefix(want, "#want:")
			c, err := ParseConfig([]byte(body))
			if err == nil {
				err = c.Validate()
			}
			if err == nil {
				t.Fatalf("accepted")
			}
			if !errors.Is(err, ErrBadConfig) {
				t.Errorf("error %v does not wrap ErrBadConfig", err)
			}
			if !strings.Contains(err.Error(), strings.TrimSpace(want)) {
				t.Errorf("error %q does not mention %q", err, want)
			}
		})
	}
}

// The example configuration shipped in deploy/ must be valid.
func TestExampleConfigIsValid(t *testing.T) {
	for _, f := range []string{"../deploy/framed.example.json"} {
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		c, err := ParseConfig(data)
		if err == nil {
			err = c.Validate()
		}
		if err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
}

func TestParseBroker(t *testing.T) {
	for in, want := range map[string]string{
		"embedded":                "embedded 127.0.0.1:1883",
		"embedded:127.0.0.1:1884": "embedded 127.0.0.1:1884",
		"tcp://lab-broker:1883":   "tcp tcp://lab-broker:1883",
		"ssl://lab-broker:8883":   "ssl ssl://lab-broker:8883",
	} {
		k, a, err := ParseBroker(in)
		if err != nil || k+" "+a != want {
			t.Errorf("ParseBroker(%q) = %q %q %v, want %q", in, k, a, err, want)
		}
	}
	for _, in := range []string{"", "mqtt://x:1", "tcp://", "tcp://host", "embedded:1884", "http://x:80"} {
		if _, _, err := ParseBroker(in); !errors.Is(err, ErrBadConfig) {
			t.Errorf("ParseBroker(%q) accepted", in)
		}
	}
}

// FuzzParseConfig: no input makes the config parser or validator panic.
func FuzzParseConfig(f *testing.F) {
	seeds, _ := filepath.Glob("../testdata/config/bad/*.json")
	seeds = append(seeds, "../deploy/framed.example.json")
	for _, s := range seeds {
		if b, err := os.ReadFile(s); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte(`{"drivers":[{"name":"a","kind":"sim"}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := ParseConfig(data)
		if err != nil {
			if !errors.Is(err, ErrBadConfig) {
				t.Fatalf("parse error %v does not wrap ErrBadConfig", err)
			}
			return
		}
		if err := c.Validate(); err != nil && !errors.Is(err, ErrBadConfig) {
			t.Fatalf("validate error %v does not wrap ErrBadConfig", err)
		}
	})
}
