package publish

import (
	"bytes"
	"encoding/json"
	"fmt"
	"slices"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"
)

// Remote commands arrive on <root>/<frame>/commands. They are off unless
// the configuration lists the commands it allows, and only the commands in
// RemoteCommands can ever be allowed: none of them moves or stops the
// frame (framed never does).
const (
	// CommandResend queues the latest result of a test for delivery again
	// (a lab system that lost it): {"cmd":"resend","test_id":"..."}.
	CommandResend = "resend"
	// CommandStatus republishes the retained status: {"cmd":"status"}.
	CommandStatus = "status"
)

// RemoteCommands is the documented set a configuration may allow.
var RemoteCommands = []string{CommandResend, CommandStatus}

// maxCommandBytes bounds one command message.
const maxCommandBytes = 4 << 10

// Command is one accepted remote command.
type Command struct {
	Cmd    string `json:"cmd"`
	TestID string `json:"test_id,omitempty"`
}

// DecodeCommand checks a command message strictly against the allowed set.
func DecodeCommand(payload []byte, allowed []string) (Command, error) {
	if len(payload) > maxCommandBytes {
		return Command{}, fmt.Errorf("%w: %d bytes, limit %d", ErrBadCommand, len(payload), maxCommandBytes)
	}
	var c Command
	dec := json.NewDecoder(bytes.NewReader(payload))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&c); err != nil {
		return Command{}, fmt.Errorf("%w: %v", ErrBadCommand, err)
	}
	if dec.More() {
		return Command{}, fmt.Errorf("%w: trailing data", ErrBadCommand)
	}
	if !slices.Contains(allowed, c.Cmd) {
		return Command{}, fmt.Errorf("%w: command %q is not allowed here", ErrBadCommand, c.Cmd)
	}
	if c.Cmd == CommandResend && (c.TestID == "" || len(c.TestID) > 200) {
		return Command{}, fmt.Errorf("%w: resend needs a test_id", ErrBadCommand)
	}
	return c, nil
}

// Commands delivers accepted remote commands (never, when none are allowed).
func (p *Publisher) Commands() <-chan Command { return p.commands }

func (p *Publisher) onCommand(_ mqtt.Client, m mqtt.Message) {
	c, err := DecodeCommand(m.Payload(), p.cfg.Commands)
	if err != nil {
		p.log.Warn("remote command rejected", "topic", m.Topic(), "reason", err.Error())
		return
	}
	if c.Cmd == CommandStatus {
		p.client.Publish(p.topics.status, 1, true, p.statusPayload("online", time.Now()))
		return
	}
	select {
	case p.commands <- c:
		p.log.Info("remote command accepted", "cmd", c.Cmd, "test_id", c.TestID)
	default:
		p.log.Warn("remote command rejected", "cmd", c.Cmd, "reason", "busy")
	}
}
