package publish_test

import (
	"context"
	"fmt"
	"log"
	"os"
	"path/filepath"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/daemon/publish"
	"framed/daemon/store"
)

// A result stored in the outbox reaches a lab system subscribed to the
// results topic, here through the embedded broker.
func Example() {
	broker, err := publish.StartEmbedded("127.0.0.1:0")
	if err != nil {
		log.Fatal(err)
	}
	defer broker.Close()

	dir, _ := os.MkdirTemp("", "framed-example")
	defer os.RemoveAll(dir)
	db, err := store.Open(filepath.Join(dir, "framed.db"), store.Options{})
	if err != nil {
		log.Fatal(err)
	}
	defer db.Close()

	// The lab system.
	got := make(chan string, 1)
	lab := mqtt.NewClient(mqtt.NewClientOptions().AddBroker(broker.URL()).SetClientID("lab"))
	if tok := lab.Connect(); !tok.WaitTimeout(5*time.Second) || tok.Error() != nil {
		log.Fatal("lab client: ", tok.Error())
	}
	defer lab.Disconnect(50)
	lab.Subscribe("framed/frame-a/results/#", 1, func(_ mqtt.Client, m mqtt.Message) {
		got <- m.Topic() + " " + string(m.Payload())
	}).Wait()

	// framed: a finished test, its result, the publisher.
	if err := db.CreateTest(store.TestMeta{ID: "T-0001", StartedAt: time.Now(), State: store.StateReduced}); err != nil {
		log.Fatal(err)
	}
	if _, err := db.PutResult("T-0001", []byte(`{"schema": "framed.result/1", "test_id": "T-0001", "revision": 1}`)); err != nil {
		log.Fatal(err)
	}
	p, err := publish.New(publish.Config{Broker: broker.URL(), Frame: "frame-a"}, db, nil)
	if err != nil {
		log.Fatal(err)
	}
	if err := p.Start(context.Background()); err != nil {
		log.Fatal(err)
	}
	defer p.Close()

	fmt.Println(<-got)
	// Output:
	// framed/frame-a/results/T-0001 {"schema":"framed.result/1","test_id":"T-0001","revision":1}
}
