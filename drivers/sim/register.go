package sim

import (
	"framed/drivers"
	"framed/drivers/builtin"
)

// The sim is built into framed under the name "sim".
func init() {
	builtin.Register("sim", func() drivers.Driver { return New() })
}
