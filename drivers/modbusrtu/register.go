package modbusrtu

import (
	"framed/drivers"
	"framed/drivers/builtin"
)

// The framed binary imports this package for its registration, so the
// daemon can start the driver by the name "modbusrtu".
func init() {
	builtin.Register(DriverName, func() drivers.Driver { return New() })
}
