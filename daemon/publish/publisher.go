package publish

import (
	"context"
	"crypto/tls"
	"encoding/json"
	"fmt"
	"log/slog"
	"net"
	"net/url"
	"sync"
	"sync/atomic"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/daemon/store"
	"framed/reduce"
)

// Publisher keeps one MQTT session for a frame: status, events, live
// readings and results out; specimens in.
type Publisher struct {
	cfg    Config
	tls    *tls.Config
	db     *store.DB
	log    *slog.Logger
	topics topics
	client mqtt.Client

	notify    chan struct{}
	specimens chan reduce.Specimen
	commands  chan Command

	closing atomic.Bool

	mu      sync.Mutex
	verif   lastVerification
	started bool
	up      chan struct{} // closed while connected
	lost    chan struct{} // closed when the current connection is lost
	cancel  context.CancelFunc
	wg      sync.WaitGroup

	live liveThrottle

	stats struct {
		resultsAcked, eventsSent, eventsDropped, liveSent, liveDropped,
		specimensAccepted, specimensRejected, connects atomic.Int64
	}

	// dial, when set by tests, opens the connection (to cut it abruptly).
	dial func(uri *url.URL, opts mqtt.ClientOptions) (net.Conn, error)
}

// Stats are counters for health reporting.
type Stats struct {
	ResultsAcked, EventsSent, EventsDropped, LiveSent, LiveDropped,
	SpecimensAccepted, SpecimensRejected, Connects int64
}

// New checks the configuration (before any I/O), then loads the TLS files
// it names, so a bad file fails here rather than at the first connection.
// db may be nil for a publisher without results (tests, live only).
func New(cfg Config, db *store.DB, logger *slog.Logger) (*Publisher, error) {
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	cfg = cfg.withDefaults()
	tlsCfg, err := cfg.tlsConfig()
	if err != nil {
		return nil, err
	}
	if logger == nil {
		logger = slog.New(slog.DiscardHandler)
	}
	p := &Publisher{
		cfg:       cfg,
		tls:       tlsCfg,
		db:        db,
		log:       logger.With("component", "publish", "broker", cfg.Broker),
		topics:    newTopics(cfg.Root, cfg.Frame),
		notify:    make(chan struct{}, 1),
		specimens: make(chan reduce.Specimen, 32),
		commands:  make(chan Command, 8),
		up:        make(chan struct{}),
		lost:      make(chan struct{}),
	}
	close(p.lost) // not connected yet
	p.live.minGap = time.Duration(float64(time.Second) / cfg.LiveRateHz)
	return p, nil
}

type statusMsg struct {
	State string `json:"state"`
	Frame string `json:"frame"`
	// At is the wall-clock time of the change, RFC 3339.
	At string `json:"at,omitempty"`
}

func (p *Publisher) statusPayload(state string, at time.Time) []byte {
	m := statusMsg{State: state, Frame: p.cfg.Frame}
	if !at.IsZero() {
		m.At = at.UTC().Format(time.RFC3339)
	}
	b, _ := json.Marshal(m) // plain strings: cannot fail
	return b
}

// Start connects in the background and keeps reconnecting; it fails only
// for a misuse (ErrStarted), never because the broker is down.
func (p *Publisher) Start(ctx context.Context) error {
	p.mu.Lock()
	if p.started {
		p.mu.Unlock()
		return ErrStarted
	}
	p.started = true
	p.mu.Unlock()

	o := mqtt.NewClientOptions().
		AddBroker(p.cfg.Broker).
		SetClientID(p.cfg.ClientID).
		SetUsername(p.cfg.Username).
		SetPassword(p.cfg.Password).
		SetKeepAlive(p.cfg.KeepAlive).
		SetPingTimeout(min(p.cfg.KeepAlive, 10*time.Second)).
		SetConnectTimeout(p.cfg.ConnectTimeout).
		SetCleanSession(true).
		SetStore(noStore{}).
		// Specimens are queued in the order the lab sent them; the
		// handler never blocks, so in-order delivery costs nothing.
		SetOrderMatters(true).
		SetAutoReconnect(true).
		SetConnectRetry(true).
		SetConnectRetryInterval(min(time.Second, p.cfg.MaxRetryInterval)).
		SetMaxReconnectInterval(p.cfg.MaxRetryInterval).
		SetBinaryWill(p.topics.status, p.statusPayload("offline", time.Time{}), 1, true).
		SetOnConnectHandler(p.onConnect).
		SetConnectionLostHandler(p.onLost)
	if p.tls != nil {
		o.SetTLSConfig(p.tls)
	}
	if p.dial != nil {
		o.SetCustomOpenConnectionFn(p.dial)
	}
	p.client = mqtt.NewClient(o)

	ctx, cancel := context.WithCancel(ctx)
	p.cancel = cancel
	p.client.Connect() // with ConnectRetry it keeps trying in the background
	if p.db != nil {
		p.wg.Add(1)
		go func() {
			defer p.wg.Done()
			p.deliver(ctx)
		}()
	}
	return nil
}

func (p *Publisher) onConnect(c mqtt.Client) {
	p.stats.connects.Add(1)
	p.log.Info("connected to broker")
	// Status and the specimen subscription are redone on each connection
	// (the session is clean). Neither handler may block the client, so
	// their tokens are not waited on here.
	p.mu.Lock()
	if isClosed(p.lost) {
		p.lost = make(chan struct{})
	}
	if !isClosed(p.up) {
		close(p.up)
	}
	p.mu.Unlock()
	if !p.closing.Load() {
		c.Publish(p.topics.status, 1, true, p.statusPayload("online", time.Now()))
		p.resendVerification()
	}
	if len(p.cfg.Commands) > 0 {
		c.Subscribe(p.topics.commands, 1, p.onCommand)
	}
	sub := c.Subscribe(p.topics.specimens, 1, p.onSpecimen)
	p.Notify()
	// A refused subscription (an ACL, say) would silently stop specimens
	// arriving: say so.
	if sub.WaitTimeout(p.cfg.AckTimeout) && sub.Error() != nil {
		p.log.Error("subscribing to specimens failed", "topic", p.topics.specimens, "err", sub.Error())
	} else if st, ok := sub.(*mqtt.SubscribeToken); ok {
		for topic, code := range st.Result() {
			if code == 0x80 {
				p.log.Error("broker refused the specimen subscription", "topic", topic)
			}
		}
	}
}

func (p *Publisher) onLost(_ mqtt.Client, err error) {
	p.log.Warn("lost broker connection", "err", err)
	p.mu.Lock()
	defer p.mu.Unlock()
	if !isClosed(p.lost) {
		close(p.lost)
	}
	// The client calls both handlers on goroutines of their own, so the
	// next connection may already be up: then only the old one is lost.
	if p.client.IsConnectionOpen() {
		p.lost = make(chan struct{})
		return
	}
	if isClosed(p.up) {
		p.up = make(chan struct{})
	}
}

func isClosed(c chan struct{}) bool {
	select {
	case <-c:
		return true
	default:
		return false
	}
}

// connection returns channels for the current state: up is closed once
// connected, lost once that connection is gone.
func (p *Publisher) connection() (up, lost chan struct{}) {
	p.mu.Lock()
	defer p.mu.Unlock()
	return p.up, p.lost
}

func (p *Publisher) connected() bool {
	up, _ := p.connection()
	return isClosed(up)
}

// Stats returns the counters so far.
func (p *Publisher) Stats() Stats {
	s := &p.stats
	return Stats{
		ResultsAcked: s.resultsAcked.Load(), EventsSent: s.eventsSent.Load(),
		EventsDropped: s.eventsDropped.Load(), LiveSent: s.liveSent.Load(),
		LiveDropped: s.liveDropped.Load(), SpecimensAccepted: s.specimensAccepted.Load(),
		SpecimensRejected: s.specimensRejected.Load(), Connects: s.connects.Load(),
	}
}

// Close stops delivery, says "offline" on the status topic (the will is
// only sent for an unclean end) and disconnects. Results not yet
// acknowledged stay in the outbox for the next start.
func (p *Publisher) Close() {
	p.mu.Lock()
	started := p.started
	cancel := p.cancel
	p.mu.Unlock()
	if !started || cancel == nil {
		return
	}
	p.closing.Store(true)
	cancel()
	p.wg.Wait()
	if p.client.IsConnectionOpen() {
		t := p.client.Publish(p.topics.status, 1, true, p.statusPayload("offline", time.Now()))
		t.WaitTimeout(2 * time.Second)
	}
	p.client.Disconnect(250)
}

// Specimens delivers valid specimen messages from the lab system.
func (p *Publisher) Specimens() <-chan reduce.Specimen { return p.specimens }

func (p *Publisher) String() string {
	return fmt.Sprintf("publisher(%s %s/%s)", p.cfg.Broker, p.cfg.Root, p.cfg.Frame)
}
