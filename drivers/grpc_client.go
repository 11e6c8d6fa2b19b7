package drivers

import (
	"context"
	"errors"
	"fmt"
	"io"
	"sync/atomic"

	"framed/proto/driverpb"
)

// streamBuffer is how many batches the client keeps ready for a slow
// consumer before it stops reading from the connection (back-pressure then
// reaches the driver through gRPC flow control).
const streamBuffer = 16

// grpcClient is the daemon's side of a driver process: a Driver whose calls
// go over gRPC.
type grpcClient struct {
	client driverpb.DriverClient
	// dead, when set, tells whether the driver process is known to have
	// exited; errors seen after that are reported as ErrPluginDead.
	dead func() bool
	// channels is the channel count of the last accepted Configure, or
	// -1 before one; batches are checked against it.
	channels atomic.Int64
}

func newGRPCClient(c driverpb.DriverClient) *grpcClient {
	g := &grpcClient{client: c}
	g.channels.Store(-1)
	return g
}

var _ Driver = (*grpcClient)(nil)

func (c *grpcClient) fail(ctx context.Context, err error) error {
	err = fromStatus(ctx, err)
	if err != nil && c.dead != nil && c.dead() && !errors.Is(err, ErrPluginDead) && ctx.Err() == nil {
		return &remoteError{msg: ErrPluginDead.Error() + ": " + err.Error(), named: ErrPluginDead}
	}
	return err
}

func (c *grpcClient) Describe(ctx context.Context) (Info, error) {
	resp, err := c.client.Describe(ctx, &driverpb.DescribeRequest{})
	if err != nil {
		return Info{}, c.fail(ctx, err)
	}
	return infoFromProto(resp.GetInfo()), nil
}

func (c *grpcClient) Configure(ctx context.Context, config []byte) (Info, error) {
	resp, err := c.client.Configure(ctx, &driverpb.ConfigureRequest{ConfigJson: config})
	if err != nil {
		return Info{}, c.fail(ctx, err)
	}
	info := infoFromProto(resp.GetInfo())
	c.channels.Store(int64(len(info.Channels)))
	return info, nil
}

func (c *grpcClient) Health(ctx context.Context) (Health, error) {
	resp, err := c.client.Health(ctx, &driverpb.HealthRequest{})
	if err != nil {
		return Health{}, c.fail(ctx, err)
	}
	return healthFromProto(resp), nil
}

// Stream returns once the driver has accepted (or refused) the stream. The
// returned channel closes after ctx is cancelled, after a batch carrying Err
// (a driver failure, or ErrPluginDead when the process went away), or when
// the driver ends the stream itself.
func (c *grpcClient) Stream(ctx context.Context) (<-chan Batch, error) {
	sctx, cancel := context.WithCancel(ctx)
	st, err := c.client.Stream(sctx, &driverpb.StreamRequest{})
	if err != nil {
		cancel()
		return nil, c.fail(ctx, err)
	}
	md, err := st.Header()
	if err == nil && len(md.Get(streamStartedKey)) == 0 {
		// The call ended without starting; its status is the reason.
		_, err = st.Recv()
		if err == nil || errors.Is(err, io.EOF) {
			err = errors.New("driver: stream ended before it started")
		}
	}
	if err != nil {
		cancel()
		return nil, c.fail(ctx, err)
	}
	channels := int(c.channels.Load())
	out := make(chan Batch, streamBuffer)
	go func() {
		defer close(out)
		defer cancel()
		var next uint64 // Seq for a final error batch: one past the last
		for {
			msg, err := st.Recv()
			if err != nil {
				if errors.Is(err, io.EOF) || ctx.Err() != nil {
					return
				}
				select {
				case out <- Batch{Seq: next, Err: c.fail(ctx, err)}:
				case <-ctx.Done():
				}
				return
			}
			if err := checkShape(msg, channels); err != nil {
				select {
				case out <- Batch{Seq: msg.GetSeq(), Err: err}:
				case <-ctx.Done():
				}
				return
			}
			next = msg.GetSeq() + 1
			select {
			case out <- batchFromProto(msg):
			case <-ctx.Done():
				return
			}
		}
	}()
	return out, nil
}

// checkShape refuses a batch the daemon could misread: one column per
// configured channel (when known), each as long as the times.
func checkShape(msg *driverpb.SampleBatch, channels int) error {
	cols := msg.GetColumns()
	if channels >= 0 && len(cols) != channels {
		return fmt.Errorf("%w: batch %d has %d columns for %d channels", ErrBadBatch, msg.GetSeq(), len(cols), channels)
	}
	n := len(msg.GetTimeNs())
	for i, c := range cols {
		if len(c.GetValues()) != n {
			return fmt.Errorf("%w: batch %d column %d has %d values for %d times", ErrBadBatch, msg.GetSeq(), i, len(c.GetValues()), n)
		}
	}
	return nil
}
