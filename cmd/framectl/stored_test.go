package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"framed/daemon"
	"framed/daemon/store"
	"framed/reduce"
	"framed/reduce/curvefile"
)

// A stored test is plotted by id from the store of a daemon that is not
// running, with the result document the daemon stored for it.
func TestPlotStoredTest(t *testing.T) {
	state := t.TempDir()
	db, err := store.Open(daemon.StorePath(state), store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(writeRambergOsgood(t, 68900, 276, 25, 20, 50))
	if err != nil {
		t.Fatal(err)
	}
	c, err := curvefile.Read(f)
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	sp := reduce.Specimen{ID: "P1", S0MM2: 20, L0MM: 50}
	res, err := reduce.Reduce(c, sp, reduce.Detected{}, reduce.Options{})
	if err != nil {
		t.Fatal(err)
	}
	doc, _ := json.Marshal(res)
	if err := db.CreateTest(store.TestMeta{ID: "T1", State: store.StateEnded}); err != nil {
		t.Fatal(err)
	}
	if err := db.WriteSamples("T1", c); err != nil {
		t.Fatal(err)
	}
	if _, err := db.PutResult("T1", doc); err != nil {
		t.Fatal(err)
	}
	if err := db.Check(); err != nil {
		t.Fatal(err)
	}
	db.Close()

	out := filepath.Join(t.TempDir(), "t1.png")
	var so, se bytes.Buffer
	if code := run([]string{"plot", "T1", "-o", out, "--state", state}, &so, &se); code != 0 {
		t.Fatalf("exit %d: %s", code, se.String())
	}
	if b, err := os.ReadFile(out); err != nil || !bytes.HasPrefix(b, []byte("\x89PNG")) {
		t.Errorf("no PNG written: %v", err)
	}
	se.Reset()
	if code := run([]string{"plot", "T2", "-o", out, "--state", state}, &so, &se); code != 1 || !strings.Contains(se.String(), `test "T2"`) {
		t.Errorf("unknown test: exit %d, %q", code, se.String())
	}
}
