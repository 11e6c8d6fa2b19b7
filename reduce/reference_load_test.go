package reduce_test

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"framed/reduce"
	"framed/reduce/curvefile"
	"framed/reduce/refcurves"
)

// refCase is one reference curve with its publisher's reported row.
type refCase struct {
	set, id string
	curve   reduce.Curve
	sp      reduce.Specimen
	rep     map[string]float64 // reported values by column name
}

// loadReference reads every set's reported.csv and the curve of each row,
// so a curve dropped into the folder with its reported row is checked too.
func loadReference(t testing.TB) []refCase {
	// Real published tension tests (sources and licence in
	// reference_test.go), found beside the repository or through
	// $FRAMED_REFERENCE_CURVES.
	dir := refcurves.Require(t)
	sets, err := filepath.Glob(filepath.Join(dir, "*", "reported.csv"))
	if err != nil || len(sets) == 0 {
		t.Fatalf("no reported.csv under %s: %v", dir, err)
	}
	var out []refCase
	for _, rp := range sets {
		f, err := os.Open(rp)
		if err != nil {
			t.Fatal(err)
		}
		rows, err := csv.NewReader(f).ReadAll()
		f.Close()
		if err != nil {
			t.Fatalf("%s: %v", rp, err)
		}
		set := filepath.Base(filepath.Dir(rp))
		for _, row := range rows[1:] {
			rc := refCase{set: set, id: row[0], rep: map[string]float64{}}
			shape := ""
			for j, name := range rows[0] {
				if v, err := strconv.ParseFloat(row[j], 64); err == nil {
					rc.rep[name] = v
				} else if name == "shape" {
					shape = row[j]
				}
			}
			rc.sp = reduce.Specimen{
				ID: rc.id, L0MM: rc.rep["L0_mm"], LeMM: rc.rep["Le_mm"],
				LuMM: rc.rep["Lu_mm"], SuMM2: rc.rep["Su_mm2"],
			}
			switch shape {
			case "round":
				rc.sp.Shape, rc.sp.D0MM = reduce.ShapeRound, rc.rep["d0_mm"]
			case "rectangular":
				rc.sp.Shape, rc.sp.A0MM, rc.sp.B0MM = reduce.ShapeRect, rc.rep["a0_mm"], rc.rep["b0_mm"]
			default:
				rc.sp.S0MM2 = rc.rep["S0_mm2"]
			}
			cf, err := os.Open(filepath.Join(filepath.Dir(rp), rc.id+".csv"))
			if err != nil {
				t.Fatal(err)
			}
			rc.curve, err = curvefile.Read(cf)
			cf.Close()
			if err != nil {
				t.Fatalf("%s/%s: %v", set, rc.id, err)
			}
			out = append(out, rc)
		}
	}
	return out
}
