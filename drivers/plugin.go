package drivers

import (
	"context"

	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"

	"framed/proto/driverpb"
)

// Plugin is the go-plugin glue for a Driver: in the driver process Impl is
// the driver being served; in the daemon Impl is unused and GRPCClient
// returns the remote Driver.
type Plugin struct {
	plugin.NetRPCUnsupportedPlugin
	Impl Driver
}

var _ plugin.GRPCPlugin = (*Plugin)(nil)

// GRPCServer registers Impl on the driver process's gRPC server.
func (p *Plugin) GRPCServer(_ *plugin.GRPCBroker, s *grpc.Server) error {
	driverpb.RegisterDriverServer(s, &grpcServer{impl: p.Impl})
	return nil
}

// GRPCClient returns the Driver that talks to the driver process over cc.
func (p *Plugin) GRPCClient(_ context.Context, _ *plugin.GRPCBroker, cc *grpc.ClientConn) (any, error) {
	return newGRPCClient(driverpb.NewDriverClient(cc)), nil
}

// PluginMap is the plugin set of one driver process: give it to
// plugin.ServeConfig (via Serve), plugin.ClientConfig (via Launch) or
// plugin.TestPluginGRPCConn, then Dispense(PluginName) and assert Driver.
// d may be nil on the client side.
func PluginMap(d Driver) map[string]plugin.Plugin {
	return map[string]plugin.Plugin{PluginName: &Plugin{Impl: d}}
}
