package drivers

import (
	"os"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"
	"google.golang.org/grpc/keepalive"
)

// maxMessageBytes bounds one gRPC message. A batch of 100 000 samples on
// four channels is about 4 MB, the gRPC default; the larger limit leaves
// room for drivers that send big batches rarely.
const maxMessageBytes = 64 << 20

// Serve runs d as a driver process: it answers the daemon's handshake on
// stdout and serves d over gRPC until the daemon kills the process. Call it
// from a driver's main (or from the daemon's own binary in driver mode, see
// drivers/builtin); it does not return until the host is gone. Started by
// hand rather than by a host, it prints a short notice and exits with 1.
func Serve(d Driver) {
	go exitWithHost(os.Getppid(), time.Second)
	plugin.Serve(&plugin.ServeConfig{
		HandshakeConfig: Handshake,
		Plugins:         PluginMap(d),
		GRPCServer: func(opts []grpc.ServerOption) *grpc.Server {
			opts = append(opts,
				grpc.MaxRecvMsgSize(maxMessageBytes), grpc.MaxSendMsgSize(maxMessageBytes),
				// The host pings a silent stream every pingInterval; the
				// default policy (once per 5 minutes) would hang up on it.
				grpc.KeepaliveEnforcementPolicy(keepalive.EnforcementPolicy{MinTime: pingInterval / 2}))
			return grpc.NewServer(opts...)
		},
		// The host reads this JSON log from stderr and re-logs it with its
		// own logger, tagged with the driver's name.
		Logger: hclog.New(&hclog.LoggerOptions{
			Name:       "driver",
			Level:      hclog.Info,
			Output:     os.Stderr,
			JSONFormat: true,
		}),
	})
}

// exitWithHost ends the driver process when the host that started it is
// gone (killed with SIGKILL, or a power cut of the daemon alone leaves
// the child re-parented): an orphaned driver would hold the serial port
// and keep the restarted daemon's new driver from opening it.
func exitWithHost(hostPID int, every time.Duration) {
	for {
		time.Sleep(every)
		if os.Getppid() != hostPID {
			os.Exit(3)
		}
	}
}
