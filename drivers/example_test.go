package drivers_test

import (
	"context"
	"fmt"
	"os"
	"path/filepath"

	"framed/drivers"
)

// An operator pins an external driver binary by its SHA-256; Launch refuses
// the binary if it has changed since.
func ExampleFileSHA256() {
	dir, err := os.MkdirTemp("", "framed-example")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "driver")
	if err := os.WriteFile(path, []byte("abc"), 0o700); err != nil {
		fmt.Println(err)
		return
	}
	sum, err := drivers.FileSHA256(path)
	fmt.Println(sum, err)
	fmt.Println(drivers.VerifySHA256(path, sum))
	// Output:
	// ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad <nil>
	// <nil>
}

// The daemon's side: launch an external driver, configure it, stream.
func ExampleLaunch() {
	ctx := context.Background()
	p, err := drivers.Launch(ctx, drivers.LaunchConfig{
		Path:   "/opt/framed/drivers/framed-driver-strainbox",
		SHA256: "0f3c...from the daemon's configuration",
	})
	if err != nil {
		fmt.Println(err) // wraps ErrNoChecksum, ErrChecksumMismatch or a start failure
		return
	}
	defer p.Kill()
	info, err := p.Configure(ctx, []byte(`{"port": "/dev/ttyUSB0"}`))
	if err != nil {
		fmt.Println(err) // errors.Is(err, drivers.ErrBadConfig) for a refused config
		return
	}
	sctx, stop := context.WithCancel(ctx)
	defer stop()
	batches, err := p.Stream(sctx)
	if err != nil {
		fmt.Println(err)
		return
	}
	for b := range batches {
		if b.Err != nil {
			fmt.Println(b.Err) // ErrDeviceGone, ErrPluginDead, ...
			return
		}
		fmt.Println(len(b.TimeNS), "samples of", len(info.Channels), "channels")
	}
}
