package store

import (
	"bufio"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"
)

const powerCutChildEnv = "FRAMED_STORE_POWERCUT_CHILD"

// TestMain lets the test binary double as the writer process of the
// power-cut test.
func TestMain(m *testing.M) {
	if path := os.Getenv(powerCutChildEnv); path != "" {
		if err := powerCutChild(path); err != nil {
			fmt.Fprintln(os.Stderr, "child:", err)
			os.Exit(3)
		}
		os.Exit(0)
	}
	os.Exit(m.Run())
}

// powerCutChild appends genCurve samples after whatever is committed,
// through an appender with its background committer running, and after
// each Flush prints "committed N" — a promise that N samples are on disk.
// It runs until killed.
func powerCutChild(path string) error {
	db, err := Open(path, Options{CommitInterval: 5 * time.Millisecond, ChunkSamples: 512, LockTimeout: 10 * time.Second})
	if err != nil {
		return err
	}
	if _, err := db.Test("T"); err != nil {
		if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
			return err
		}
	}
	m, err := db.Test("T")
	if err != nil {
		return err
	}
	next := m.Samples
	a := db.Appender("T")
	rng := rand.New(rand.NewPCG(uint64(time.Now().UnixNano()), 1))
	for i := 0; ; i++ {
		n := 1 + rng.IntN(700)
		if err := a.Append(genCurve(next, n)); err != nil {
			return err
		}
		next += n
		if i%5 == 0 {
			if err := a.Flush(); err != nil {
				return err
			}
			m, err := db.Test("T")
			if err != nil {
				return err
			}
			fmt.Printf("committed %d\n", m.Samples)
		}
	}
}

// TestPowerCut kills a writer process with SIGKILL at random moments and
// checks after each kill that the store is consistent and holds every
// sample the writer reported committed, bit for bit. 5 kills by default,
// 50 with FRAMED_LONG=1.
func TestPowerCut(t *testing.T) {
	kills := 5
	if os.Getenv("FRAMED_LONG") == "1" {
		kills = 50
	}
	exe, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "framed.db")
	rng := rand.New(rand.NewPCG(42, uint64(time.Now().UnixNano())))
	promised := 0
	for k := 0; k < kills; k++ {
		cmd := exec.Command(exe, "-test.run=^$")
		cmd.Env = append(os.Environ(), powerCutChildEnv+"="+path)
		out, err := cmd.StdoutPipe()
		if err != nil {
			t.Fatal(err)
		}
		var stderr strings.Builder
		cmd.Stderr = &stderr
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		lines := make(chan int, 1024)
		go func() {
			defer close(lines)
			sc := bufio.NewScanner(out)
			for sc.Scan() {
				if n, err := strconv.Atoi(strings.TrimPrefix(sc.Text(), "committed ")); err == nil {
					lines <- n
				}
			}
		}()
		// Wait for the first promise, then let it run a random while.
		select {
		case n, ok := <-lines:
			if !ok {
				cmd.Wait()
				t.Fatalf("child exited before committing: %s", stderr.String())
			}
			promised = max(promised, n)
		case <-time.After(30 * time.Second):
			cmd.Process.Kill()
			t.Fatal("child made no progress")
		}
		time.Sleep(time.Duration(rng.IntN(80)) * time.Millisecond)
		if err := cmd.Process.Kill(); err != nil {
			t.Fatal(err)
		}
		for n := range lines {
			promised = max(promised, n)
		}
		cmd.Wait()

		db, err := Open(path, Options{})
		if err != nil {
			t.Fatal(err)
		}
		var once sync.Once
		closeDB := func() { once.Do(func() { closeChecked(t, db) }) }
		t.Cleanup(closeDB) // checked even when a check below fails
		got, err := db.ReadSamples("T")
		if err != nil {
			t.Fatalf("kill %d: %v", k, err)
		}
		if got.Len() < promised {
			t.Fatalf("kill %d: %d samples stored, %d were reported committed", k, got.Len(), promised)
		}
		requireSameCurve(t, got, genCurve(0, got.Len()))
		closeDB() // before the next writer opens the file
		t.Logf("kill %d: %d samples stored, %d promised", k, got.Len(), promised)
	}
}
