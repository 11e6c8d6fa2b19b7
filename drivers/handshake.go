package drivers

import "github.com/hashicorp/go-plugin"

// ProtocolVersion is the version of the driver wire contract
// (proto/driver.proto plus the conventions of the shims). Raise it whenever
// an old daemon and a new driver (or the reverse) could misread each other,
// and record the change here.
//
//	1: first contract: Describe, Configure (JSON bytes), server-streamed
//	   columnar SampleBatch (sfixed64 times, one packed double column per
//	   channel, seq, gap_before_ns), Health; the Stream call sends a header
//	   once acquisition has started; named errors travel as gRPC codes
//	   (see errorcodes.go).
const ProtocolVersion = 1

// PluginName is the name under which a driver process offers its Driver.
const PluginName = "driver"

// Handshake is the one handshake configuration of framed's driver
// processes. The magic cookie is not a secret: it only stops a driver binary
// started by hand from waiting forever for a host that will never come.
var Handshake = plugin.HandshakeConfig{
	ProtocolVersion:  ProtocolVersion,
	MagicCookieKey:   "FRAMED_DRIVER_PLUGIN",
	MagicCookieValue: "9b1f6c2e-frame-sensor-driver",
}
