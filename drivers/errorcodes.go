package drivers

import (
	"context"
	"errors"

	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"
)

// errorCodes maps each named error that crosses the process boundary to the
// gRPC code that carries it. Unavailable is reserved for ErrPluginDead: gRPC
// itself reports a lost connection (a dead process) with that code.
var errorCodes = []struct {
	err  error
	code codes.Code
}{
	{ErrBadConfig, codes.InvalidArgument},
	{ErrNotConfigured, codes.FailedPrecondition},
	{ErrDeviceGone, codes.Aborted},
	{ErrStreaming, codes.AlreadyExists},
	{ErrPluginDead, codes.Unavailable},
}

// toStatus turns a driver's error into a gRPC status error whose code names
// the error and whose message is the driver's full message.
func toStatus(err error) error {
	if err == nil {
		return nil
	}
	if _, ok := status.FromError(err); ok {
		// Already a status (e.g. from the transport): pass it on.
		return err
	}
	for _, ec := range errorCodes {
		if errors.Is(err, ec.err) {
			return status.Error(ec.code, err.Error())
		}
	}
	if errors.Is(err, context.Canceled) {
		return status.Error(codes.Canceled, err.Error())
	}
	if errors.Is(err, context.DeadlineExceeded) {
		return status.Error(codes.DeadlineExceeded, err.Error())
	}
	return status.Error(codes.Unknown, err.Error())
}

// remoteError is an error that came back from a driver process: it keeps the
// driver's message and unwraps to the named error its code stands for.
type remoteError struct {
	msg   string
	named error
}

func (e *remoteError) Error() string { return e.msg }
func (e *remoteError) Unwrap() error { return e.named }

// fromStatus turns an error of a gRPC call made with ctx back into a named
// error where its code names one. A call that failed because ctx ended
// returns ctx's error; a call that failed because the connection went away
// (Unavailable, or Canceled although ctx is live: the client connection
// was closed under it) returns an error wrapping ErrPluginDead.
func fromStatus(ctx context.Context, err error) error {
	if err == nil {
		return nil
	}
	st, ok := status.FromError(err)
	if !ok {
		return err
	}
	switch st.Code() {
	case codes.Canceled, codes.DeadlineExceeded:
		if ctx.Err() != nil {
			return ctx.Err()
		}
		if st.Code() == codes.Canceled {
			return &remoteError{msg: ErrPluginDead.Error() + ": " + st.Message(), named: ErrPluginDead}
		}
	case codes.Unavailable:
		return &remoteError{msg: ErrPluginDead.Error() + ": " + st.Message(), named: ErrPluginDead}
	}
	for _, ec := range errorCodes {
		if ec.code == st.Code() {
			return &remoteError{msg: st.Message(), named: ec.err}
		}
	}
	return &remoteError{msg: st.Message(), named: nil}
}
