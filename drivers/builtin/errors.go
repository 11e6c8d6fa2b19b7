package builtin

import "errors"

// ErrUnknownDriver: no built-in driver has the given name.
var ErrUnknownDriver = errors.New("builtin: unknown driver")
