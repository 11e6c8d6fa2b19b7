package reduce

// SchemaVersion names the result document's layout. Bump the suffix only for
// incompatible changes; adding fields is compatible.
const SchemaVersion = "framed.result/1"

// Result is the result document published on framed/<frame>/results/<id>
// and printed by `framectl reduce --json`. Its JSON names are a contract
// (see the project's design notes): extend, never rename.
type Result struct {
	Schema   string       `json:"schema"`
	TestID   string       `json:"test_id"`
	Revision int          `json:"revision"`
	Frame    string       `json:"frame"`
	Specimen SpecimenInfo `json:"specimen"`
	// StartedAt is RFC 3339 wall-clock time of the first sample, when known.
	StartedAt    string        `json:"started_at,omitempty"`
	Events       []Event       `json:"events"`
	Holds        []Hold        `json:"holds"`
	Unloads      []Unload      `json:"unloads"`
	ElasticLimit *ElasticLimit `json:"elastic_limit,omitempty"`
	Flags        []string      `json:"flags"`
	Quantities   []Quantity    `json:"quantities"`
	// Calibration names the calibrations the channels used.
	Calibration []CalibrationRef `json:"calibration,omitempty"`
	// Fit records the elastic fit behind E (range and ASTM E111 statistics).
	Fit *ElasticFit `json:"fit,omitempty"`
}

// Quantity is one reported property in the standards' own symbol.
type Quantity struct {
	Symbol string  `json:"symbol"`
	Value  float64 `json:"value"`
	Unit   string  `json:"unit"`
	Method string  `json:"method,omitempty"`
	// U is the expanded uncertainty (k=2) in Unit, when known.
	U *float64 `json:"u,omitempty"`
}

// Event kinds of the result document and of framed/<frame>/events.
const (
	EventStart  = "start"
	EventHold   = "hold"
	EventUnload = "unload"
	EventBreak  = "break"
	EventEnd    = "end"
)

// Event is a moment in the test on the recording's own time axis.
type Event struct {
	Kind  string  `json:"kind"`
	TimeS float64 `json:"time_s"`
	// ForceN is the force at the event, when it means something (peak
	// before a break, settled force of a hold).
	ForceN *float64 `json:"force_N,omitempty"`
}

// Hold is a settled load step: the swing died out and the reading is stable.
type Hold struct {
	StartS      float64 `json:"start_s"`
	SettledS    float64 `json:"settled_s"`
	EndS        float64 `json:"end_s"`
	ForceN      float64 `json:"force_N"`
	ExtensionMM float64 `json:"extension_mm"`
	// CreepMMPerS is the rate at which extension grew at constant force.
	CreepMMPerS float64 `json:"creep_mm_per_s"`
	// RelaxationNPerS is the rate at which force fell at fixed position
	// (negative when it falls).
	RelaxationNPerS float64 `json:"relaxation_N_per_s"`
}

// Unload is a return to no (or the hanger's) load and the set it showed.
type Unload struct {
	TimeS       float64 `json:"time_s"`
	AfterForceN float64 `json:"after_force_N"`
	SetMM       float64 `json:"set_mm"`
}

// ElasticLimit brackets the elastic limit between the highest load that left
// no permanent set and the lowest that did. Either side may be unknown.
type ElasticLimit struct {
	NoSetUpToN *float64 `json:"no_set_up_to_N,omitempty"`
	SetFromN   *float64 `json:"set_from_N,omitempty"`
}

// CalibrationRef names the calibration a channel's readings went through.
type CalibrationRef struct {
	Channel string `json:"channel"`
	ID      string `json:"id"`
	At      string `json:"at,omitempty"`
}

// ElasticFit documents the fit behind E.
type ElasticFit struct {
	FromMPa float64 `json:"from_MPa"`
	ToMPa   float64 `json:"to_MPa"`
	Points  int     `json:"points"`
	R2      float64 `json:"r2"`
	// V1Pct is the coefficient of variation of the slope (ASTM E111), %.
	V1Pct float64 `json:"v1_pct"`
	// Apparent is set when strain came from the crosshead, not an extensometer.
	Apparent bool `json:"apparent,omitempty"`
}

// Detected is what the event detector found in a recording; reduce copies
// it into the result document and uses the break time.
type Detected struct {
	Events       []Event
	Holds        []Hold
	Unloads      []Unload
	ElasticLimit *ElasticLimit
	Flags        []string
}
