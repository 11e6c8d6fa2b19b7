package store_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"
	"time"

	"framed/daemon/store"
	"framed/reduce"
)

// A test is created, its samples appended and committed, read back in one
// pass, and its result queued for delivery.
func Example() {
	dir, err := os.MkdirTemp("", "framed-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	db, err := store.Open(filepath.Join(dir, "framed.db"), store.Options{})
	if err != nil {
		log.Fatal(err)
	}
	defer db.Close()

	start := time.Date(2026, 3, 4, 8, 30, 0, 0, time.UTC)
	if err := db.CreateTest(store.TestMeta{ID: "T-0001", Frame: "frame-a", StartedAt: start}); err != nil {
		log.Fatal(err)
	}
	a := db.Appender("T-0001")
	batch := reduce.Curve{
		TimeS:  []float64{0, 0.001, 0.002},
		ForceN: []float64{0.4, 12.9, 25.3},
	}
	if err := a.Append(batch); err != nil {
		log.Fatal(err)
	}
	if err := a.Close(); err != nil { // commits what is buffered
		log.Fatal(err)
	}
	c, err := db.ReadSamples("T-0001")
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("samples:", c.Len(), "force:", c.ForceN, "extension column:", c.ExtensionMM == nil)

	rev, err := db.PutResult("T-0001", []byte(`{"test_id":"T-0001","revision":1}`))
	if err != nil {
		log.Fatal(err)
	}
	items, err := db.OutboxPending(10)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("revision:", rev, "waiting:", len(items))
	// After the broker's PUBACK:
	if err := db.OutboxDone(items[0].Seq); err != nil {
		log.Fatal(err)
	}
	fmt.Println("delivered:", db.Delivered("T-0001"))
	if err := db.Check(); err != nil {
		log.Fatal(err)
	}
	// Output:
	// samples: 3 force: [0.4 12.9 25.3] extension column: true
	// revision: 1 waiting: 1
	// delivered: 1
}
