package publish

import (
	"crypto/tls"
	"crypto/x509"
	"fmt"
	"net"
	"net/url"
	"os"
	"slices"
	"strings"
	"time"
)

// Config says where and how to publish. Zero fields take the defaults
// noted beside them.
type Config struct {
	// Broker is tcp://host:port or ssl://host:port.
	Broker string
	// Root is the first topic level, default "framed".
	Root string
	// Frame identifies this frame: the second topic level.
	Frame string
	// ClientID defaults to "framed-<frame>".
	ClientID string
	Username string
	Password string
	// TLS is used as given for ssl:// brokers; otherwise CAFile (and
	// CertFile with KeyFile for a client certificate) build one.
	TLS      *tls.Config
	CAFile   string
	CertFile string
	KeyFile  string
	// KeepAlive, default 30 s: how soon the broker notices a dead
	// connection (and publishes the offline will).
	KeepAlive time.Duration
	// ConnectTimeout for one attempt, default 10 s.
	ConnectTimeout time.Duration
	// MaxRetryInterval caps the back-off between connection attempts,
	// default 10 s.
	MaxRetryInterval time.Duration
	// AckTimeout is how long a result waits for its PUBACK before it is
	// sent again, default 30 s.
	AckTimeout time.Duration
	// LiveRateHz throttles the live topic, default 5.
	LiveRateHz float64
	// MaxSpecimenBytes refuses larger specimen messages, default 64 KiB.
	MaxSpecimenBytes int
	// Commands lists the remote commands accepted on <root>/<frame>/commands
	// (a subset of RemoteCommands). Empty, the default: none, and the topic
	// is not even subscribed.
	Commands []string
}

func (c Config) withDefaults() Config {
	if c.Root == "" {
		c.Root = "framed"
	}
	if c.ClientID == "" {
		c.ClientID = "framed-" + c.Frame
	}
	if c.KeepAlive <= 0 {
		c.KeepAlive = 30 * time.Second
	}
	if c.ConnectTimeout <= 0 {
		c.ConnectTimeout = 10 * time.Second
	}
	if c.MaxRetryInterval <= 0 {
		c.MaxRetryInterval = 10 * time.Second
	}
	if c.AckTimeout <= 0 {
		c.AckTimeout = 30 * time.Second
	}
	if c.LiveRateHz <= 0 {
		c.LiveRateHz = 5
	}
	if c.MaxSpecimenBytes <= 0 {
		c.MaxSpecimenBytes = 64 << 10
	}
	return c
}

// Validate checks the configuration without touching the network or the
// files it names.
func (c Config) Validate() error {
	c = c.withDefaults()
	u, err := url.Parse(c.Broker)
	if err != nil {
		// The parse error quotes the URL, which may hold a password.
		return fmt.Errorf("%w: the broker URL does not parse; want tcp://host:port or ssl://host:port", ErrBadConfig)
	}
	if u.User != nil {
		// Never echo it: the URL holds a secret.
		return fmt.Errorf("%w: broker URL %s carries a user name or password: give them as the username and password settings instead", ErrBadConfig, u.Redacted())
	}
	for _, cmd := range c.Commands {
		if !slices.Contains(RemoteCommands, cmd) {
			return fmt.Errorf("%w: remote command %q: the commands that can be allowed are %v", ErrBadConfig, cmd, RemoteCommands)
		}
	}
	if u.Scheme != "tcp" && u.Scheme != "ssl" {
		return fmt.Errorf("%w: broker %q: scheme must be tcp:// or ssl://", ErrBadConfig, c.Broker)
	}
	host, port, err := net.SplitHostPort(u.Host)
	if err != nil || host == "" || port == "" {
		return fmt.Errorf("%w: broker %q: want host:port", ErrBadConfig, c.Broker)
	}
	if (u.Path != "" && u.Path != "/") || u.RawQuery != "" {
		return fmt.Errorf("%w: broker %q: unexpected path or query", ErrBadConfig, c.Broker)
	}
	if err := topicLevel(c.Frame); err != nil {
		return fmt.Errorf("%w: frame %q: %v", ErrBadConfig, c.Frame, err)
	}
	for _, lvl := range strings.Split(c.Root, "/") {
		if err := topicLevel(lvl); err != nil {
			return fmt.Errorf("%w: root %q: %v", ErrBadConfig, c.Root, err)
		}
	}
	if len(c.ClientID) > 23*10 { // generous; brokers commonly accept long ids
		return fmt.Errorf("%w: client id %q too long", ErrBadConfig, c.ClientID)
	}
	if (c.CertFile == "") != (c.KeyFile == "") {
		return fmt.Errorf("%w: a client certificate needs both CertFile and KeyFile", ErrBadConfig)
	}
	if u.Scheme == "tcp" && (c.TLS != nil || c.CAFile != "" || c.CertFile != "") {
		return fmt.Errorf("%w: TLS settings given for plain tcp:// broker %q", ErrBadConfig, c.Broker)
	}
	if c.Password != "" && c.Username == "" {
		return fmt.Errorf("%w: password without username", ErrBadConfig)
	}
	return nil
}

// tlsConfig builds the TLS configuration (reading the files: I/O, so only
// after Validate).
func (c Config) tlsConfig() (*tls.Config, error) {
	if !strings.HasPrefix(c.Broker, "ssl://") {
		return nil, nil
	}
	if c.TLS != nil {
		return c.TLS, nil
	}
	t := &tls.Config{MinVersion: tls.VersionTLS12}
	if c.CAFile != "" {
		pem, err := os.ReadFile(c.CAFile)
		if err != nil {
			return nil, fmt.Errorf("broker CA: %w", err)
		}
		pool := x509.NewCertPool()
		if !pool.AppendCertsFromPEM(pem) {
			return nil, fmt.Errorf("%w: no certificate in CA file %q", ErrBadConfig, c.CAFile)
		}
		t.RootCAs = pool
	}
	if c.CertFile != "" {
		cert, err := tls.LoadX509KeyPair(c.CertFile, c.KeyFile)
		if err != nil {
			return nil, fmt.Errorf("client certificate: %w", err)
		}
		t.Certificates = []tls.Certificate{cert}
	}
	return t, nil
}
