package drivers

import (
	"context"
	"sync"
	"time"

	"google.golang.org/grpc/metadata"

	"framed/proto/driverpb"
)

// streamStartedKey is the header the server sends once the driver accepted
// a Stream call, so the client can return Stream's error synchronously.
const streamStartedKey = "framed-stream-started"

// A client sees its stream's channel close as soon as it cancels, while the
// cancellation reaches the server (and the driver) a moment later; an
// immediate restart could then find the driver still streaming. So a new
// Stream call first waits up to cancelGrace for a running call's
// cancellation to arrive, and then up to windDownWait for a cancelled call
// to finish. A call that is still live after cancelGrace is a genuine
// second stream, which the driver refuses with ErrStreaming.
const (
	cancelGrace  = 200 * time.Millisecond
	windDownWait = 2 * time.Second
)

// activeStream is the latest Stream call on the server.
type activeStream struct {
	ctx  context.Context
	done chan struct{} // closed when the call has returned
}

// grpcServer serves one Driver over gRPC in the driver process.
type grpcServer struct {
	driverpb.UnimplementedDriverServer
	impl Driver

	mu     sync.Mutex
	latest *activeStream
}

var _ driverpb.DriverServer = (*grpcServer)(nil)

func (s *grpcServer) Describe(ctx context.Context, _ *driverpb.DescribeRequest) (*driverpb.DescribeResponse, error) {
	info, err := s.impl.Describe(ctx)
	if err != nil {
		return nil, toStatus(err)
	}
	return &driverpb.DescribeResponse{Info: infoToProto(info)}, nil
}

func (s *grpcServer) Configure(ctx context.Context, req *driverpb.ConfigureRequest) (*driverpb.ConfigureResponse, error) {
	info, err := s.impl.Configure(ctx, req.GetConfigJson())
	if err != nil {
		return nil, toStatus(err)
	}
	return &driverpb.ConfigureResponse{Info: infoToProto(info)}, nil
}

func (s *grpcServer) Health(ctx context.Context, _ *driverpb.HealthRequest) (*driverpb.HealthResponse, error) {
	h, err := s.impl.Health(ctx)
	if err != nil {
		return nil, toStatus(err)
	}
	return healthToProto(h), nil
}

func (s *grpcServer) Stream(_ *driverpb.StreamRequest, srv driverpb.Driver_StreamServer) error {
	ctx, cancel := context.WithCancel(srv.Context())
	defer cancel()

	s.mu.Lock()
	prev := s.latest
	s.mu.Unlock()
	if prev != nil {
		prev.waitEnd(ctx)
	}

	batches, err := s.impl.Stream(ctx)
	if err != nil {
		return toStatus(err)
	}
	// Only an accepted call becomes the one a later call waits for: a
	// refused second call must not hide a stream that still runs.
	this := &activeStream{ctx: ctx, done: make(chan struct{})}
	defer close(this.done)
	s.mu.Lock()
	s.latest = this
	s.mu.Unlock()
	// From here on the driver's channel must be drained until it closes, so
	// that the driver's goroutine ends before this call returns and a
	// restart finds the driver idle.
	defer func() {
		cancel()
		for range batches {
		}
	}()
	if err := srv.SendHeader(metadata.Pairs(streamStartedKey, "1")); err != nil {
		return err
	}
	for b := range batches {
		if b.Err != nil {
			return toStatus(b.Err)
		}
		if err := srv.Send(batchToProto(b)); err != nil {
			return err
		}
	}
	if err := ctx.Err(); err != nil {
		return toStatus(err)
	}
	return nil
}

// waitEnd waits, within the bounds above, for the call a to end.
func (a *activeStream) waitEnd(ctx context.Context) {
	grace := time.NewTimer(cancelGrace)
	defer grace.Stop()
	select {
	case <-a.done:
		return
	case <-a.ctx.Done():
	case <-grace.C:
		return
	case <-ctx.Done():
		return
	}
	wind := time.NewTimer(windDownWait)
	defer wind.Stop()
	select {
	case <-a.done:
	case <-wind.C:
	case <-ctx.Done():
	}
}
