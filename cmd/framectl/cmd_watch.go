package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/reduce"
)

func init() {
	register(&command{name: "watch", summary: "subscribe to a broker and print results (and events) as a lab system receives them", run: runWatch})
}

func runWatch(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("watch", flag.ContinueOnError)
	fs.SetOutput(stderr)
	broker := fs.String("broker", "tcp://127.0.0.1:1883", "broker `URL` (tcp://host:port or ssl://host:port)")
	root := fs.String("root", "framed", "topic root")
	frame := fs.String("frame", "+", "frame `ID` to watch (+: every frame)")
	events := fs.Bool("events", true, "print events and status changes too")
	raw := fs.Bool("json", false, "print each message as topic and raw JSON")
	count := fs.Int("count", 0, "exit after this many results (0: run until interrupted)")
	user := fs.String("username", "", "broker user name")
	passFile := fs.String("password-file", "", "file holding the broker password")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	opts := mqtt.NewClientOptions().AddBroker(*broker).
		SetClientID(fmt.Sprintf("framectl-watch-%d", os.Getpid())).
		SetCleanSession(true).SetAutoReconnect(true).SetConnectRetry(true).
		SetConnectRetryInterval(time.Second)
	if *user != "" {
		opts.SetUsername(*user)
	}
	if *passFile != "" {
		pw, err := os.ReadFile(*passFile)
		if err != nil {
			return err
		}
		opts.SetPassword(strings.TrimRight(string(pw), "\r\n"))
	}
	var mu sync.Mutex
	results := 0
	done := make(chan struct{})
	handle := func(_ mqtt.Client, m mqtt.Message) {
		mu.Lock()
		defer mu.Unlock()
		if results >= *count && *count > 0 {
			return
		}
		parts := strings.Split(m.Topic(), "/")
		kind := ""
		if len(parts) >= 3 {
			kind = parts[len(parts)-1]
			if len(parts) >= 4 && parts[len(parts)-2] == "results" {
				kind = "results"
			}
		}
		if *raw {
			fmt.Fprintf(stdout, "%s %s\n", m.Topic(), m.Payload())
		} else {
			switch kind {
			case "results":
				printPublished(stdout, m.Payload())
			case "events", "status":
				if *events {
					fmt.Fprintf(stdout, "%s  %-8s %s\n", time.Now().Format("15:04:05"), kind, m.Payload())
				}
			}
		}
		if kind == "results" {
			results++
			if *count > 0 && results == *count {
				close(done)
			}
		}
	}
	subs := map[string]byte{
		*root + "/" + *frame + "/results/+": 1,
	}
	if *events || *raw {
		subs[*root+"/"+*frame+"/events"] = 1
		subs[*root+"/"+*frame+"/status"] = 1
	}
	opts.SetOnConnectHandler(func(c mqtt.Client) {
		c.SubscribeMultiple(subs, handle)
	})
	c := mqtt.NewClient(opts)
	tok := c.Connect()
	if !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		return fmt.Errorf("connect to %s: %v (is framed or the broker running?)", *broker, tok.Error())
	}
	defer c.Disconnect(250)
	fmt.Fprintf(stderr, "watching %s/%s on %s (Ctrl-C to stop)\n", *root, *frame, *broker)
	select {
	case <-ctx.Done():
	case <-done:
	}
	return nil
}

// printPublished shows a published result document the way a person
// reads a report.
func printPublished(w io.Writer, payload []byte) {
	var r reduce.Result
	if err := json.Unmarshal(payload, &r); err != nil {
		fmt.Fprintf(w, "result that is not a result document (%v): %.200q\n", err, payload)
		return
	}
	fmt.Fprintf(w, "\n== result %s (revision %d, frame %s)  %s\n", r.TestID, r.Revision, r.Frame, r.Specimen.Material)
	printResult(w, r)
}

// printSteps shows the holds, unloads and elastic limit of a stepped test.
func printSteps(w io.Writer, r reduce.Result) {
	for _, h := range r.Holds {
		fmt.Fprintf(w, "hold   settled at %.1f s: %.1f N, %.4f mm, creep %.3g mm/s\n", h.SettledS, h.ForceN, h.ExtensionMM, h.CreepMMPerS)
	}
	for _, u := range r.Unloads {
		fmt.Fprintf(w, "unload at %.1f s after %.1f N: set %.4f mm\n", u.TimeS, u.AfterForceN, u.SetMM)
	}
	if el := r.ElasticLimit; el != nil {
		fmt.Fprintf(w, "elastic limit between %s (no set) and %s (set)\n", optN(el.NoSetUpToN), optN(el.SetFromN))
	}
}

func optN(v *float64) string {
	if v == nil {
		return "?"
	}
	return fmt.Sprintf("%.1f N", *v)
}
