package publish

import (
	"errors"
	"fmt"
	"log/slog"
	"syscall"

	mqttserver "github.com/mochi-mqtt/server/v2"
	"github.com/mochi-mqtt/server/v2/listeners"
	"github.com/mochi-mqtt/server/v2/packets"
)

// DefaultEmbeddedAddr is where the embedded broker listens unless told
// otherwise: loopback only, so a single box needs no broker set up and
// exposes nothing.
const DefaultEmbeddedAddr = "127.0.0.1:1883"

// Embedded is an MQTT broker running inside framed.
type Embedded struct {
	server   *mqttserver.Server
	listener *listeners.TCP
}

// StartEmbedded starts a broker on addr (DefaultEmbeddedAddr when empty)
// that lets every client in. When the port is taken it fails with an
// error wrapping ErrPortInUse that says how to use that broker instead.
func StartEmbedded(addr string) (*Embedded, error) {
	return StartEmbeddedLogged(addr, nil)
}

// StartEmbeddedLogged is StartEmbedded with the broker's own log going to
// logger (nil: discarded).
func StartEmbeddedLogged(addr string, logger *slog.Logger) (*Embedded, error) {
	if addr == "" {
		addr = DefaultEmbeddedAddr
	}
	if logger == nil {
		logger = slog.New(slog.DiscardHandler)
	}
	s := mqttserver.New(&mqttserver.Options{Logger: logger, InlineClient: false})
	if err := s.AddHook(new(allowAll), nil); err != nil {
		return nil, fmt.Errorf("embedded broker: %w", err)
	}
	l := listeners.NewTCP(listeners.Config{ID: "framed-tcp", Address: addr})
	if err := s.AddListener(l); err != nil {
		if errors.Is(err, syscall.EADDRINUSE) {
			return nil, fmt.Errorf("embedded broker on %s: %w: another broker probably holds it; to use that broker run framed with --broker tcp://%s, or give the embedded one another address with --broker embedded:HOST:PORT", addr, ErrPortInUse, addr)
		}
		return nil, fmt.Errorf("embedded broker on %s: %w", addr, err)
	}
	if err := s.Serve(); err != nil {
		s.Close()
		return nil, fmt.Errorf("embedded broker on %s: %w", addr, err)
	}
	return &Embedded{server: s, listener: l}, nil
}

// Addr is the address the broker actually listens on (useful with port 0).
func (e *Embedded) Addr() string { return e.listener.Address() }

// URL is the broker URL a Config wants: tcp://Addr.
func (e *Embedded) URL() string { return "tcp://" + e.Addr() }

// Close stops the broker and drops its clients.
func (e *Embedded) Close() error { return e.server.Close() }

// allowAll lets every client connect and use every topic: the embedded
// broker listens on loopback by default, for the single box it runs on.
// (Written here rather than taken from the broker's auth package, which
// would pull in a YAML library for its ledger.)
type allowAll struct {
	mqttserver.HookBase
}

func (h *allowAll) ID() string { return "framed-allow-all" }

func (h *allowAll) Provides(b byte) bool {
	return b == mqttserver.OnConnectAuthenticate || b == mqttserver.OnACLCheck
}

func (h *allowAll) OnConnectAuthenticate(*mqttserver.Client, packets.Packet) bool { return true }

func (h *allowAll) OnACLCheck(*mqttserver.Client, string, bool) bool { return true }
