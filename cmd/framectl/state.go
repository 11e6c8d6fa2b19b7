package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"framed/daemon"
	"framed/daemon/store"
)

// stateFlag adds --state to a command: the daemon's state directory, or
// FRAMED_STATE when not given.
func stateFlag(fs *flag.FlagSet) *string {
	return fs.String("state", "", "framed's state `DIR` (default $FRAMED_STATE)")
}

func stateDir(flagValue string) (string, error) {
	if flagValue != "" {
		return flagValue, nil
	}
	if v := os.Getenv("FRAMED_STATE"); v != "" {
		return v, nil
	}
	return "", fmt.Errorf("%w: give --state DIR (the daemon's state directory) or set FRAMED_STATE", errUsage)
}

// callDaemon sends one control request to the daemon of dir.
func callDaemon(ctx context.Context, dir string, req daemon.Request, out any) error {
	ctx, cancel := context.WithTimeout(ctx, 30*time.Second)
	defer cancel()
	return daemon.Call(ctx, filepath.Join(dir, daemon.ControlSocketName), req, out)
}

// withStore asks the running daemon, or, when none runs, opens the store
// itself (read-only use; the daemon holds the store's lock while it runs).
func withStore(ctx context.Context, dir string, req daemon.Request, out any, direct func(db *store.DB) error) error {
	err := callDaemon(ctx, dir, req, out)
	if err == nil || !errors.Is(err, daemon.ErrNotRunning) {
		return err
	}
	path := daemon.StorePath(dir)
	if _, serr := os.Stat(path); serr != nil {
		return fmt.Errorf("no framed state in %s (no daemon answers and there is no %s)", dir, filepath.Base(path))
	}
	db, oerr := store.Open(path, store.Options{LockTimeout: 2 * time.Second})
	if oerr != nil {
		return oerr
	}
	defer db.Close()
	return direct(db)
}
