package verify

import (
	"encoding/json"
	"fmt"
)

// Class is a class of a force measuring system (ISO 7500-1) or of an
// extensometer (ISO 9513). The zero value, NoClass, means no class is met;
// it marshals to JSON null. Smaller non-zero values are better classes, so
// the worse of two classes is the larger (with NoClass worst of all).
type Class uint8

// Force measuring system classes (ISO 7500-1) and extensometer classes
// (ISO 9513). Class05 is both "0.5" classes; Class02 is used only by
// extensometers.
const (
	NoClass Class = iota
	Class02
	Class05
	Class1
	Class2
	Class3
)

var classNames = [...]string{NoClass: "", Class02: "0.2", Class05: "0.5", Class1: "1", Class2: "2", Class3: "3"}

// String gives the class as the standards write it ("0.5", "1", ...) or
// "none" for NoClass.
func (c Class) String() string {
	if c == NoClass {
		return "none"
	}
	if int(c) < len(classNames) {
		return classNames[c]
	}
	return fmt.Sprintf("Class(%d)", uint8(c))
}

// Worse returns the worse of c and d. NoClass is worse than any class.
func (c Class) Worse(d Class) Class {
	if c == NoClass || d == NoClass {
		return NoClass
	}
	return max(c, d)
}

// MarshalJSON writes the class as a string ("0.5") or null for NoClass.
func (c Class) MarshalJSON() ([]byte, error) {
	if c == NoClass {
		return []byte("null"), nil
	}
	if int(c) >= len(classNames) {
		return nil, fmt.Errorf("verify: cannot marshal unknown class %d", uint8(c))
	}
	return json.Marshal(classNames[c])
}

// UnmarshalJSON reads a class written by MarshalJSON.
func (c *Class) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		*c = NoClass
		return nil
	}
	var s string
	if err := json.Unmarshal(b, &s); err != nil {
		return fmt.Errorf("verify: class must be a string or null: %w", err)
	}
	for i, n := range classNames {
		if i != int(NoClass) && n == s {
			*c = Class(i)
			return nil
		}
	}
	return fmt.Errorf("verify: unknown class %q", s)
}

// Tolerance is the relative slack allowed when comparing a value with a
// class limit. A value on the limit meets the class (ISO 7500-1 gives
// maximum permissible values), and a value a few ulps above the limit,
// from binary rounding of a value that is exactly on it in decimal, also
// meets it: 1e-9 relative is far below any meaningful reading difference
// (1 part in a billion of the limit) and far above float64 rounding
// (about 1 part in 1e16).
const Tolerance = 1e-9

// within reports |x| <= limit, allowing Tolerance relative slack.
func within(x, limit float64) bool {
	if x < 0 {
		x = -x
	}
	return x <= limit*(1+Tolerance)
}
