package bench_test

import (
	"os"

	"framed/daemon/bench"
)

// A report prints as a table; the ratio is always value / limit.
func ExampleReport_WriteTable() {
	var r bench.Report
	ok := true
	r.Add(bench.Figure{Name: "cpu_1khz", Value: 2.5, Unit: "% of one core", Limit: 5,
		LimitKind: bench.LimitTarget, LimitName: "target", Target: "value < limit", Pass: &ok})
	r.Add(bench.Figure{Name: "reduce", Value: 0.16, Unit: "s", Limit: 0.08,
		LimitKind: bench.LimitMeasured, LimitName: "one sequential read", Target: "ratio <= 2", Pass: &ok})
	r.WriteTable(os.Stdout)
	// Output:
	// FIGURE    VALUE  UNIT           LIMIT  LIMIT IS             RATIO  TARGET         PASS
	// cpu_1khz  2.50   % of one core  5.00   target               0.5    value < limit  yes
	// reduce    0.16   s              0.08   one sequential read  2.00   ratio <= 2     yes
}
