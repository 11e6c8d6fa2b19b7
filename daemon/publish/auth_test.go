package publish

import (
	"os"
	"os/exec"
	"path/filepath"
	"testing"
	"time"

	"framed/daemon/publish/brokertest"
)

// With a broker that refuses anonymous clients, the right credentials
// deliver; wrong ones never connect and never make the publisher fail.
func TestCredentialsIntegration(t *testing.T) {
	tool, err := exec.LookPath("mosquitto_passwd")
	if err != nil {
		if os.Getenv(brokertest.RequireEnv) == "1" {
			t.Fatal("mosquitto_passwd not found: install Debian package mosquitto")
		}
		t.Skip("mosquitto_passwd not found: install Debian package mosquitto; CI requires it")
	}
	pw := filepath.Join(t.TempDir(), "passwd")
	if out, err := exec.Command(tool, "-b", "-c", pw, "frame-a", "s3cret-reading").CombinedOutput(); err != nil {
		t.Fatalf("mosquitto_passwd: %v: %s", err, out)
	}
	hashed, err := os.ReadFile(pw)
	if err != nil {
		t.Fatal(err)
	}
	broker, _, _ := brokertest.StartMosquittoWith(t, brokertest.Options{Template: "auth.conf", Files: map[string][]byte{"passwd": hashed}})

	wrong, err := New(Config{Broker: broker, Frame: "frame-b", Username: "frame-a", Password: "guess", MaxRetryInterval: 100 * time.Millisecond}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if err := wrong.Start(t.Context()); err != nil {
		t.Fatal(err)
	}
	defer wrong.Close()

	db := openStore(t, t.TempDir())
	putResult(t, db, "T-1")
	p, err := New(Config{Broker: broker, Frame: "frame-a", Username: "frame-a", Password: "s3cret-reading"}, db, nil)
	if err != nil {
		t.Fatal(err)
	}
	if err := p.Start(t.Context()); err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	waitFor(t, "result delivered", func() bool { return db.Delivered("T-1") == 1 })
	if wrong.connected() {
		t.Fatal("connected with a wrong password")
	}
}
