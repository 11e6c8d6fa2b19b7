package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"
	"time"

	"framed/daemon"
	"framed/daemon/store"
)

func init() {
	register(&command{name: "tests", summary: "list the stored tests and their result revisions", run: runTests})
}

func runTests(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("tests", flag.ContinueOnError)
	fs.SetOutput(stderr)
	state := stateFlag(fs)
	asJSON := fs.Bool("json", false, "print JSON: [{test_id, started_at, state, samples, result_revision}]")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	dir, err := stateDir(*state)
	if err != nil {
		return err
	}
	var tests []store.TestMeta
	err = withStore(ctx, dir, daemon.Request{Op: "tests"}, &tests, func(db *store.DB) (err error) {
		tests, err = db.Tests()
		return err
	})
	if err != nil {
		return err
	}
	if tests == nil {
		tests = []store.TestMeta{}
	}
	if *asJSON {
		return json.NewEncoder(stdout).Encode(tests)
	}
	tw := tabwriter.NewWriter(stdout, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "TEST\tSTARTED\tSTATE\tSAMPLES\tRESULT REV\tFLAGS")
	for _, t := range tests {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%d\t%d\t%v\n", t.ID, t.StartedAt.Local().Format(time.DateTime), t.State, t.Samples, t.ResultRevision, t.Flags)
	}
	return tw.Flush()
}
