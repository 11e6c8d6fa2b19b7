package drivers

import (
	"errors"
	"strings"
	"testing"
)

func TestDecodeConfig(t *testing.T) {
	type cfg struct {
		Port string `json:"port"`
		Baud int    `json:"baud"`
	}
	var c cfg
	if err := DecodeConfig("x", []byte(`{"port":"/dev/ttyUSB0","baud":9600}`), &c); err != nil || c.Baud != 9600 {
		t.Fatalf("good config: %+v %v", c, err)
	}
	for name, in := range map[string]string{
		"unknown field": `{"prot":"/dev/ttyUSB0"}`,
		"wrong type":    `{"baud":"fast"}`,
		"trailing":      `{"baud":1} {}`,
		"empty":         ``,
		"not json":      `port=/dev/ttyUSB0`,
	} {
		err := DecodeConfig("x", []byte(in), &c)
		if !errors.Is(err, ErrBadConfig) || !strings.Contains(err.Error(), "x:") {
			t.Errorf("%s: %v, want ErrBadConfig naming the driver", name, err)
		}
	}
}
