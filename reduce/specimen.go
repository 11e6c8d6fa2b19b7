package reduce

// Shape of a specimen's cross-section.
type Shape string

const (
	ShapeRound Shape = "round"
	ShapeRect  Shape = "rect"
	ShapeTube  Shape = "tube"
	// ShapeWire is a wire or strand of unknown section: S0 = m / (rho Lt).
	ShapeWire Shape = "wire"
)

// Specimen is the geometry and identity of a test piece. Lengths in mm,
// areas in mm2, mass in g, density in g/cm3.
type Specimen struct {
	ID       string `json:"id,omitempty"`
	Material string `json:"material,omitempty"`
	Shape    Shape  `json:"shape,omitempty"`
	// Round: D0MM. Rect: A0MM (thickness) and B0MM (width).
	// Tube: A0MM (wall) and OuterD0MM.
	D0MM      float64 `json:"d0_mm,omitempty"`
	A0MM      float64 `json:"a0_mm,omitempty"`
	B0MM      float64 `json:"b0_mm,omitempty"`
	OuterD0MM float64 `json:"D0_mm,omitempty"`
	// Wire: MassG over TotalLengthMM (Lt) at DensityGPerCM3.
	MassG          float64 `json:"mass_g,omitempty"`
	TotalLengthMM  float64 `json:"Lt_mm,omitempty"`
	DensityGPerCM3 float64 `json:"density_g_per_cm3,omitempty"`
	// S0MM2 set directly overrides the shape.
	S0MM2 float64 `json:"S0_mm2,omitempty"`
	// L0MM is the original gauge length (elongation after fracture);
	// LeMM the extensometer gauge length (extensions), default L0MM.
	L0MM float64 `json:"L0_mm,omitempty"`
	LeMM float64 `json:"Le_mm,omitempty"`
	// After fracture, when measured: LuMM (fitted-together gauge length),
	// SuMM2 or DuMM (smallest section or diameter).
	LuMM  float64 `json:"Lu_mm,omitempty"`
	SuMM2 float64 `json:"Su_mm2,omitempty"`
	DuMM  float64 `json:"du_mm,omitempty"`
	// AuMM and BuMM are a flat specimen's smallest thickness and width
	// after fracture (Su = au bu when SuMM2 is not given).
	AuMM float64 `json:"au_mm,omitempty"`
	BuMM float64 `json:"bu_mm,omitempty"`
}

// SpecimenInfo is the specimen as the result document shows it: the
// geometry given plus the cross-section actually used.
type SpecimenInfo struct {
	Specimen
	UsedS0MM2 float64 `json:"used_S0_mm2,omitempty"`
}
