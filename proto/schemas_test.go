package proto

import (
	"bytes"
	"encoding/json"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"framed/daemon/detect"
	"framed/daemon/publish"
	"framed/daemon/store"
	"framed/reduce"
	"framed/reduce/curvefile"
	"framed/reduce/refcurves"
)

func compile(t *testing.T, name string) *jsonschema.Schema {
	t.Helper()
	c := jsonschema.NewCompiler()
	err := fs.WalkDir(Schemas, "schemas", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := Schemas.ReadFile(p)
		if err != nil {
			return err
		}
		doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
		if err != nil {
			return err
		}
		return c.AddResource("https://framed.invalid/schemas/"+filepath.Base(p), doc)
	})
	if err != nil {
		t.Fatal(err)
	}
	s, err := c.Compile("https://framed.invalid/schemas/" + name + ".schema.json")
	if err != nil {
		t.Fatalf("schema %s: %v", name, err)
	}
	return s
}

func validate(t *testing.T, s *jsonschema.Schema, doc []byte) error {
	t.Helper()
	v, err := jsonschema.UnmarshalJSON(bytes.NewReader(doc))
	if err != nil {
		t.Fatalf("not JSON: %v", err)
	}
	return s.Validate(v)
}

// Real result documents, reduced from published reference curves (CC BY
// 4.0; sources in the project README), satisfy the result schema, and the
// schema is not vacuous: a strength in the wrong unit or a missing list
// fails it.
func TestResultDocumentsMatchSchema(t *testing.T) {
	s := compile(t, "result")
	dir := refcurves.Require(t)
	for _, tc := range []struct {
		file string
		sp   reduce.Specimen
	}{
		{"S355/Zx2.csv", reduce.Specimen{Shape: reduce.ShapeRect, A0MM: 5.9913, B0MM: 20.101, L0MM: 60, LeMM: 50, LuMM: 81, SuMM2: 49.585}},
		{"42CrMoS4/46NT71.csv", reduce.Specimen{Shape: reduce.ShapeRound, D0MM: 5.003, L0MM: 25, LeMM: 25, SuMM2: 8.764211}},
	} {
		f, err := os.Open(filepath.Join(dir, tc.file))
		if err != nil {
			t.Fatal(err)
		}
		c, err := curvefile.Read(f)
		f.Close()
		if err != nil {
			t.Fatal(err)
		}
		res, err := reduce.Reduce(c, tc.sp, detect.Offline(c, detect.Config{}), reduce.Options{})
		if err != nil {
			t.Fatal(err)
		}
		res.TestID, res.Frame, res.Revision, res.StartedAt = "20261202T101500Z", "bench-a", 1, time.Date(2026, 12, 2, 10, 15, 0, 0, time.UTC).Format(time.RFC3339Nano)
		res.Finite()
		doc, _ := json.Marshal(res)
		if err := validate(t, s, doc); err != nil {
			t.Errorf("%s: %v", tc.file, err)
		}
		bad := bytes.Replace(doc, []byte(`"unit":"GPa"`), []byte(`"unit":"MPa"`), 1)
		if validate(t, s, bad) == nil {
			t.Errorf("%s: E in MPa passed the schema", tc.file)
		}
		var m map[string]any
		json.Unmarshal(doc, &m)
		delete(m, "quantities")
		noQ, _ := json.Marshal(m)
		if validate(t, s, noQ) == nil {
			t.Errorf("%s: a document without quantities passed", tc.file)
		}
	}
	// A stepped test's hold without an extensometer: extension is null.
	r := reduce.Result{Schema: reduce.SchemaVersion, TestID: "t", Frame: "f", Events: []reduce.Event{}, Flags: []string{}, Quantities: []reduce.Quantity{},
		Holds: []reduce.Hold{{StartS: 1, SettledS: 2, EndS: 3, ForceN: 14.7, ExtensionMM: nan()}}, Unloads: []reduce.Unload{}}
	doc, _ := json.Marshal(r)
	if err := validate(t, s, doc); err != nil {
		t.Errorf("hold without extension: %v", err)
	}
}

// The inbound specimen decoder and the specimen schema agree on what is a
// specimen message.
func TestSpecimenSchemaAgreesWithDecoder(t *testing.T) {
	s := compile(t, "specimen")
	for _, msg := range []string{
		`{"id":"B-1142","material":"S235","shape":"rect","a0_mm":4,"b0_mm":20,"L0_mm":80}`,
		`{"id":"W1","shape":"wire","mass_g":12.3,"Lt_mm":1000,"density_g_per_cm3":8.9,"L0_mm":200}`,
		`{"id":"X","bogus":1}`,
		`{"id":"X","shape":"hexagon"}`,
		`{"id":"X","d0_mm":-5}`,
		`[1,2]`,
	} {
		_, decErr := publish.DecodeSpecimen([]byte(msg), 64<<10)
		schemaErr := validate(t, s, []byte(msg))
		if (decErr == nil) != (schemaErr == nil) {
			t.Errorf("%s: decoder says %v, schema says %v", msg, decErr, schemaErr)
		}
	}
}

// Golden verification reports (hand-worked ISO 7500-1 cases in
// testdata/verify) satisfy the verification schema.
func TestVerificationReportsMatchSchema(t *testing.T) {
	s := compile(t, "verification")
	files, _ := filepath.Glob("../testdata/verify/*/expected.json")
	if len(files) == 0 {
		t.Fatal("no golden verification reports")
	}
	for _, f := range files {
		if strings.Contains(f, "extensometer") {
			continue // ISO 9513 reports have a layout of their own
		}
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if err := validate(t, s, b); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
}

// Events, stored-test listings and commands as the code writes them.
func TestMessagesMatchSchemas(t *testing.T) {
	f := 8771.4
	ev, _ := json.Marshal(publish.EventMsg{TestID: "t1", Kind: "break", TimeS: 20.99, ForceN: &f, Detail: map[string]any{"set_mm": 0.012}})
	if err := validate(t, compile(t, "event"), ev); err != nil {
		t.Errorf("event: %v", err)
	}
	tests, _ := json.Marshal([]store.TestMeta{{ID: "t1", StartedAt: time.Now(), State: store.StateReduced, Samples: 10, ResultRevision: 1}})
	if err := validate(t, compile(t, "tests"), tests); err != nil {
		t.Errorf("tests listing: %v", err)
	}
	cs := compile(t, "command")
	for _, msg := range []string{`{"cmd":"resend","test_id":"x"}`, `{"cmd":"status"}`, `{"cmd":"stop"}`, `{"cmd":"resend","test_id":"x","more":1}`} {
		_, decErr := publish.DecodeCommand([]byte(msg), publish.RemoteCommands)
		schemaErr := validate(t, cs, []byte(msg))
		if (decErr == nil) != (schemaErr == nil) {
			t.Errorf("%s: decoder says %v, schema says %v", msg, decErr, schemaErr)
		}
	}
}

func nan() float64 { return math.NaN() }
