package daemon

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"regexp"
	"strings"
	"time"

	"framed/reduce"
)

// Config is the daemon's configuration file (JSON). Everything is checked by
// Validate before any file, port or process is touched, so a typo stops the
// daemon at once with a message that names the field.
type Config struct {
	// Frame names this test frame; it is a level of every MQTT topic.
	Frame string `json:"frame"`
	// StateDir holds all persistent state (bbolt store, control socket).
	StateDir string `json:"state_dir,omitempty"`
	// Broker is tcp://host:port, ssl://host:port, or embedded[:ADDR].
	Broker string     `json:"broker,omitempty"`
	MQTT   MQTTConfig `json:"mqtt"`
	// Drivers that feed the frame's channels; at least one.
	Drivers []DriverConfig `json:"drivers"`
	// Channels maps the frame's signals (force, extension, crosshead) to
	// "driver/channel". Empty: the first channel of each quantity.
	Channels ChannelMap       `json:"channels"`
	Detect   DetectConfig     `json:"detect"`
	Store    StoreConfig      `json:"store"`
	Specimen *reduce.Specimen `json:"default_specimen,omitempty"`
	// CalibrationMaxAgeDays: older calibrations are flagged stale (0: 365).
	CalibrationMaxAgeDays float64 `json:"calibration_max_age_days,omitempty"`
	// ForceClass is the ISO 7500-1 class of the force channel used for the
	// uncertainty of results, as verified ("0.5", "1", "2", "3"; "" unknown).
	ForceClass string `json:"force_class,omitempty"`
	// ExtensometerClass per ISO 9513 ("0.2", "0.5", "1", "2"; "" unknown).
	ExtensometerClass string `json:"extensometer_class,omitempty"`
	// ComplianceMMPerN corrects crosshead extension for the load train's
	// own stretch on frames without an extensometer.
	ComplianceMMPerN float64 `json:"compliance_mm_per_N,omitempty"`
}

// MQTTConfig says how framed talks to the lab's broker.
type MQTTConfig struct {
	Root     string `json:"root,omitempty"`
	ClientID string `json:"client_id,omitempty"`
	Username string `json:"username,omitempty"`
	// PasswordFile holds the password; it never appears in the config or logs.
	PasswordFile string `json:"password_file,omitempty"`
	// CAFile verifies the broker's certificate for ssl://; CertFile and
	// KeyFile are an optional client certificate.
	CAFile   string `json:"ca_file,omitempty"`
	CertFile string `json:"cert_file,omitempty"`
	KeyFile  string `json:"key_file,omitempty"`
	// LiveHz throttles framed/<frame>/live (0: 5 Hz; negative: off).
	LiveHz float64 `json:"live_hz,omitempty"`
	// RemoteCommands allows commands on framed/<frame>/commands, from the
	// documented set ("resend", "status"). Empty, the default: none.
	RemoteCommands []string `json:"remote_commands,omitempty"`
}

// DriverConfig is one driver process.
type DriverConfig struct {
	// Name is this driver's name in the frame, used in channel references.
	Name string `json:"name"`
	// Kind names a built-in driver (sim, replay, lineserial, modbusrtu).
	Kind string `json:"kind,omitempty"`
	// Path runs an external driver binary instead; SHA256 must then match.
	Path   string `json:"path,omitempty"`
	SHA256 string `json:"sha256,omitempty"`
	// Config is passed verbatim to the driver's Configure.
	Config json.RawMessage `json:"config,omitempty"`
	// DelayMS is the driver's transport delay: its samples are shifted
	// earlier by this much before channels are merged.
	DelayMS float64 `json:"delay_ms,omitempty"`
}

// ChannelMap picks the driver channel behind each frame signal.
type ChannelMap struct {
	Force     string `json:"force,omitempty"`
	Extension string `json:"extension,omitempty"`
	Crosshead string `json:"crosshead,omitempty"`
}

// DetectConfig tunes event detection; zero values take the detector's
// defaults.
type DetectConfig struct {
	// ForceRangeN is the force channel's full scale (0: from the driver).
	ForceRangeN float64 `json:"force_range_N,omitempty"`
	// PreTriggerS is how much history before the start is stored (0: 2 s).
	PreTriggerS float64 `json:"pretrigger_s,omitempty"`
	// StartFraction of the force range starts a test (0: the detector's
	// default, 1 %). Lower it on a large load cell used for small
	// specimens (wires on a 100 kN frame), never below the noise.
	StartFraction float64 `json:"start_fraction,omitempty"`
	// HangerN is the weight of an empty dead-weight hanger hung after the
	// tare: unloads return to it.
	HangerN float64 `json:"hanger_N,omitempty"`
	// EndHoldS is how long a test must rest unloaded to end (0: default).
	EndHoldS float64 `json:"end_hold_s,omitempty"`
}

// StoreConfig tunes the raw store.
type StoreConfig struct {
	// CommitIntervalMS bounds how long a sample waits before it is durable
	// (0: 100 ms).
	CommitIntervalMS float64 `json:"commit_interval_ms,omitempty"`
	// OutboxMax bounds undelivered results (0: store default).
	OutboxMax int `json:"outbox_max,omitempty"`
	// RetentionDays and RetentionMB prune raw data of delivered tests.
	RetentionDays float64 `json:"retention_days,omitempty"`
	RetentionMB   float64 `json:"retention_mb,omitempty"`
}

// ParseConfig decodes a configuration strictly: unknown fields, trailing
// data and wrong types are errors that name the problem.
func ParseConfig(data []byte) (Config, error) {
	var c Config
	if len(bytes.TrimSpace(data)) == 0 {
		return Config{}, fmt.Errorf("%w: the file is empty; see deploy/framed.example.json", ErrBadConfig)
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&c); err != nil {
		return Config{}, fmt.Errorf("%w: %v", ErrBadConfig, describeJSONError(data, err))
	}
	if dec.More() {
		return Config{}, fmt.Errorf("%w: trailing data after the JSON object", ErrBadConfig)
	}
	return c, nil
}

func describeJSONError(data []byte, err error) string {
	var off int64 = -1
	switch e := err.(type) {
	case *json.SyntaxError:
		off = e.Offset
	case *json.UnmarshalTypeError:
		off = e.Offset
	}
	if off < 0 {
		return err.Error()
	}
	line := 1 + bytes.Count(data[:min(int(off), len(data))], []byte{'\n'})
	return fmt.Sprintf("line %d: %v", line, err)
}

var topicLevel = regexp.MustCompile(`^[A-Za-z0-9_.-]{1,64}$`)

// Validate checks the configuration without any I/O and fills defaults.
func (c *Config) Validate() error {
	bad := func(format string, a ...any) error {
		return fmt.Errorf("%w: "+format, append([]any{ErrBadConfig}, a...)...)
	}
	if c.Frame == "" {
		c.Frame = "frame1"
	}
	if !topicLevel.MatchString(c.Frame) {
		return bad("frame %q: use 1-64 letters, digits, '.', '_' or '-' (it is an MQTT topic level)", c.Frame)
	}
	if c.MQTT.Root == "" {
		c.MQTT.Root = "framed"
	}
	for _, lvl := range strings.Split(c.MQTT.Root, "/") {
		if !topicLevel.MatchString(lvl) {
			return bad("mqtt.root %q: each level must be letters, digits, '.', '_' or '-'", c.MQTT.Root)
		}
	}
	if c.MQTT.LiveHz == 0 {
		c.MQTT.LiveHz = 5
	}
	if c.Broker == "" {
		c.Broker = "embedded"
	}
	if _, _, err := ParseBroker(c.Broker); err != nil {
		return err
	}
	if len(c.Drivers) == 0 {
		return bad("no drivers: add at least one to \"drivers\"")
	}
	seen := map[string]bool{}
	for i, d := range c.Drivers {
		where := fmt.Sprintf("drivers[%d]", i)
		if !topicLevel.MatchString(d.Name) {
			return bad("%s.name %q: use letters, digits, '.', '_' or '-'", where, d.Name)
		}
		if seen[d.Name] {
			return bad("%s.name %q is used twice", where, d.Name)
		}
		seen[d.Name] = true
		switch {
		case d.Kind == "" && d.Path == "":
			return bad("%s (%s): set \"kind\" (a built-in driver) or \"path\" (an external driver binary)", where, d.Name)
		case d.Kind != "" && d.Path != "":
			return bad("%s (%s): set either \"kind\" or \"path\", not both", where, d.Name)
		case d.Path != "" && !regexp.MustCompile(`^[0-9a-f]{64}$`).MatchString(d.SHA256):
			return bad("%s (%s): an external driver needs \"sha256\": the binary's SHA-256 as 64 lowercase hex digits", where, d.Name)
		}
		if d.DelayMS < 0 || d.DelayMS > 10000 || math.IsNaN(d.DelayMS) {
			return bad("%s.delay_ms %v: must be within 0..10000", where, d.DelayMS)
		}
	}
	for sig, ref := range map[string]string{"force": c.Channels.Force, "extension": c.Channels.Extension, "crosshead": c.Channels.Crosshead} {
		if ref == "" {
			continue
		}
		drv, _, ok := strings.Cut(ref, "/")
		if !ok || !seen[drv] {
			return bad("channels.%s %q: want \"driver/channel\" naming a configured driver", sig, ref)
		}
	}
	if c.Detect.PreTriggerS == 0 {
		c.Detect.PreTriggerS = 2
	}
	if c.Detect.PreTriggerS < 0 || c.Detect.PreTriggerS > 60 {
		return bad("detect.pretrigger_s %v: must be within 0..60", c.Detect.PreTriggerS)
	}
	if c.Detect.StartFraction < 0 || c.Detect.StartFraction > 0.5 || c.Detect.HangerN < 0 || c.Detect.EndHoldS < 0 {
		return bad("detect: start_fraction must be within 0..0.5, hanger_N and end_hold_s not negative")
	}
	if c.Detect.ForceRangeN < 0 {
		return bad("detect.force_range_N %v: must not be negative", c.Detect.ForceRangeN)
	}
	if c.Store.CommitIntervalMS == 0 {
		c.Store.CommitIntervalMS = 100
	}
	if c.Store.CommitIntervalMS < 1 || c.Store.CommitIntervalMS > 100 {
		return bad("store.commit_interval_ms %v: must be within 1..100 (samples must be durable within 100 ms)", c.Store.CommitIntervalMS)
	}
	if c.Store.RetentionDays < 0 || c.Store.RetentionMB < 0 || c.Store.OutboxMax < 0 {
		return bad("store: retention and outbox limits must not be negative")
	}
	if c.CalibrationMaxAgeDays == 0 {
		c.CalibrationMaxAgeDays = 365
	}
	switch c.ForceClass {
	case "", "0.5", "1", "2", "3":
	default:
		return bad("force_class %q: want 0.5, 1, 2 or 3", c.ForceClass)
	}
	switch c.ExtensometerClass {
	case "", "0.2", "0.5", "1", "2":
	default:
		return bad("extensometer_class %q: want 0.2, 0.5, 1 or 2", c.ExtensometerClass)
	}
	if c.ComplianceMMPerN < 0 {
		return bad("compliance_mm_per_N must not be negative")
	}
	return nil
}

// CommitInterval is the store's commit interval.
func (c *Config) CommitInterval() time.Duration {
	return time.Duration(c.Store.CommitIntervalMS * float64(time.Millisecond))
}

// ParseBroker splits a --broker value: ("embedded", "127.0.0.1:1883") or
// ("tcp"|"ssl", "tcp://host:port").
func ParseBroker(s string) (kind, addr string, err error) {
	switch {
	case s == "embedded":
		return "embedded", "127.0.0.1:1883", nil
	case strings.HasPrefix(s, "embedded:"):
		addr = strings.TrimPrefix(s, "embedded:")
		if !strings.Contains(addr, ":") {
			return "", "", fmt.Errorf("%w: broker %q: embedded:ADDR needs host:port, e.g. embedded:127.0.0.1:1884", ErrBadConfig, s)
		}
		return "embedded", addr, nil
	case strings.HasPrefix(s, "tcp://"), strings.HasPrefix(s, "ssl://"):
		hp := s[6:]
		if strings.Contains(hp, "@") {
			// Never echo it: the URL holds a secret.
			return "", "", fmt.Errorf("%w: the broker URL carries a user name or password; set mqtt.username and mqtt.password_file instead", ErrBadConfig)
		}
		if i := strings.LastIndex(hp, ":"); i <= 0 || i == len(hp)-1 {
			return "", "", fmt.Errorf("%w: broker %q: want %s//host:port", ErrBadConfig, s, s[:4])
		}
		return s[:3], s, nil
	}
	return "", "", fmt.Errorf("%w: broker %q: want tcp://host:port, ssl://host:port or embedded[:ADDR]", ErrBadConfig, s)
}
