package drivers

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
)

// DecodeConfig decodes a driver's JSON configuration into v strictly, so a
// typo never silently falls back to a default: unknown fields, a wrong
// type and trailing data are errors. Every error wraps ErrBadConfig and
// names the driver. Drivers call it first in Configure, before any I/O.
func DecodeConfig(driver string, data []byte, v any) error {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		return fmt.Errorf("%w: %s: %w", ErrBadConfig, driver, err)
	}
	if err := dec.Decode(&struct{}{}); !errors.Is(err, io.EOF) {
		return fmt.Errorf("%w: %s: trailing data after the JSON object", ErrBadConfig, driver)
	}
	return nil
}
