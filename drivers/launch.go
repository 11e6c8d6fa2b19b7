package drivers

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"
	"google.golang.org/grpc/keepalive"
)

// LaunchConfig says which driver process to start.
type LaunchConfig struct {
	// Cmd is the unstarted command of the driver process. When nil, Path
	// and Args build it.
	Cmd  *exec.Cmd
	Path string
	Args []string
	// SHA256 is the hex SHA-256 the binary must have before it is run
	// (see FileSHA256). It is required for every binary other than the
	// running executable itself, which is how built-in drivers run.
	SHA256 string
	// Logger receives the host side's log and the driver's own log lines.
	// Nil logs warnings and errors to stderr.
	Logger hclog.Logger
	// StartTimeout bounds the handshake (default one minute).
	StartTimeout time.Duration
	// PingTimeout bounds the answer to a liveness ping. While a stream is
	// open, the host pings a driver process that has been silent for
	// pingInterval; one that does not answer within PingTimeout (default
	// 5 s) counts as dead, so a hung (not only a crashed) driver ends its
	// stream with ErrPluginDead.
	PingTimeout time.Duration
}

// pingInterval is how long a stream may be silent before the host pings
// the driver process; gRPC allows no less than 10 s. The server side
// (Serve) permits pings this often.
const pingInterval = 10 * time.Second

// Launch starts a driver process and connects to it. The returned Process
// is a Driver; call Kill when done with it (plugin.CleanupClients also
// kills every launched process, e.g. at daemon shutdown). ctx bounds only
// the start: a process that has not answered when ctx ends is killed.
func Launch(ctx context.Context, cfg LaunchConfig) (*Process, error) {
	cmd := cfg.Cmd
	if cmd == nil {
		if cfg.Path == "" {
			return nil, errors.New("driver launch: neither Cmd nor Path given")
		}
		cmd = exec.Command(cfg.Path, cfg.Args...)
	}
	if cmd.Err != nil {
		return nil, fmt.Errorf("driver launch: %w", cmd.Err)
	}
	var secure *plugin.SecureConfig
	if cfg.SHA256 != "" {
		if err := VerifySHA256(cmd.Path, cfg.SHA256); err != nil {
			return nil, fmt.Errorf("driver launch: %w", err)
		}
		sum, _ := hex.DecodeString(cfg.SHA256) // checked by VerifySHA256
		secure = &plugin.SecureConfig{Checksum: sum, Hash: sha256.New()}
	} else if !isSelf(cmd.Path) {
		return nil, fmt.Errorf("driver launch: %w: %q", ErrNoChecksum, cmd.Path)
	}
	pingTimeout := cfg.PingTimeout
	if pingTimeout <= 0 {
		pingTimeout = 5 * time.Second
	}
	logger := cfg.Logger
	if logger == nil {
		logger = hclog.New(&hclog.LoggerOptions{Name: "driver", Level: hclog.Warn, Output: os.Stderr})
	}
	client := plugin.NewClient(&plugin.ClientConfig{
		HandshakeConfig:  Handshake,
		Plugins:          PluginMap(nil),
		Cmd:              cmd,
		SecureConfig:     secure,
		AllowedProtocols: []plugin.Protocol{plugin.ProtocolGRPC},
		Logger:           logger,
		StartTimeout:     cfg.StartTimeout,
		Managed:          true,
		GRPCDialOptions: []grpc.DialOption{
			grpc.WithDefaultCallOptions(grpc.MaxCallRecvMsgSize(maxMessageBytes), grpc.MaxCallSendMsgSize(maxMessageBytes)),
			grpc.WithKeepaliveParams(keepalive.ClientParameters{Time: pingInterval, Timeout: pingTimeout}),
		},
	})

	type started struct {
		d   *grpcClient
		err error
	}
	ready := make(chan started, 1)
	go func() {
		rpc, err := client.Client()
		if err != nil {
			ready <- started{err: err}
			return
		}
		raw, err := rpc.Dispense(PluginName)
		if err != nil {
			ready <- started{err: err}
			return
		}
		d, ok := raw.(*grpcClient)
		if !ok {
			ready <- started{err: fmt.Errorf("plugin %q is a %T, not a driver", PluginName, raw)}
			return
		}
		ready <- started{d: d}
	}()
	var s started
	select {
	case s = <-ready:
	case <-ctx.Done():
		client.Kill()
		return nil, fmt.Errorf("driver launch %q: %w", cmd.Path, ctx.Err())
	}
	if s.err != nil {
		client.Kill()
		return nil, fmt.Errorf("driver launch %q: %w", cmd.Path, s.err)
	}
	s.d.dead = client.Exited
	p := &Process{client: client, d: s.d}
	if rc := client.ReattachConfig(); rc != nil {
		p.pid = rc.Pid
	}
	return p, nil
}

// isSelf tells whether path is the running executable.
func isSelf(path string) bool {
	self, err := os.Executable()
	if err != nil {
		return false
	}
	a, err1 := filepath.EvalSymlinks(self)
	b, err2 := filepath.EvalSymlinks(path)
	return err1 == nil && err2 == nil && a == b
}
