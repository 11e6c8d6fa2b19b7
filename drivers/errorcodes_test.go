package drivers

import (
	"context"
	"errors"
	"fmt"
	"testing"

	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"
)

// Every named error must come back from the wire as itself, with the
// driver's message intact.
func TestNamedErrorsCrossTheWire(t *testing.T) {
	ctx := context.Background()
	for _, named := range []error{ErrBadConfig, ErrNotConfigured, ErrDeviceGone, ErrStreaming, ErrPluginDead} {
		sent := fmt.Errorf("port %q: %w", "/dev/ttyUSB0", named)
		got := fromStatus(ctx, toStatus(sent))
		if !errors.Is(got, named) {
			t.Errorf("%v came back as %v, not wrapping it", named, got)
		}
		for _, other := range []error{ErrBadConfig, ErrNotConfigured, ErrDeviceGone, ErrStreaming, ErrPluginDead} {
			if other != named && errors.Is(got, other) {
				t.Errorf("%v came back also as %v", named, other)
			}
		}
		if named != ErrPluginDead && got.Error() != sent.Error() {
			t.Errorf("message %q came back as %q", sent.Error(), got.Error())
		}
	}
}

func TestUnnamedErrorKeepsMessage(t *testing.T) {
	sent := errors.New("board said \"E7\"")
	got := fromStatus(context.Background(), toStatus(sent))
	if got.Error() != sent.Error() {
		t.Errorf("message %q came back as %q", sent, got)
	}
	for _, named := range []error{ErrBadConfig, ErrNotConfigured, ErrDeviceGone, ErrStreaming, ErrPluginDead} {
		if errors.Is(got, named) {
			t.Errorf("plain error came back wrapping %v", named)
		}
	}
}

func TestTransportErrors(t *testing.T) {
	live := context.Background()
	if err := fromStatus(live, status.Error(codes.Unavailable, "connection refused")); !errors.Is(err, ErrPluginDead) {
		t.Errorf("Unavailable: %v, want ErrPluginDead", err)
	}
	// A connection closed under a live call (the client was killed).
	if err := fromStatus(live, status.Error(codes.Canceled, "grpc: the client connection is closing")); !errors.Is(err, ErrPluginDead) {
		t.Errorf("Canceled on a live ctx: %v, want ErrPluginDead", err)
	}
	done, cancel := context.WithCancel(live)
	cancel()
	if err := fromStatus(done, status.Error(codes.Canceled, "context canceled")); !errors.Is(err, context.Canceled) || errors.Is(err, ErrPluginDead) {
		t.Errorf("Canceled on a cancelled ctx: %v, want context.Canceled only", err)
	}
	if toStatus(nil) != nil || fromStatus(live, nil) != nil {
		t.Error("nil error did not stay nil")
	}
}
