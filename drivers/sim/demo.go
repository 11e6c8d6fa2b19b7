package sim

import "framed/reduce"

// DemoScenario names the invented workshop whose QA bench the demo plays:
// incoming bar, strip and wire for a small wire-and-fastener maker.
const DemoScenario = "Ottermill Wire & Fastener Co., goods-in QA bench"

// DemoHangerKG is the empty hanger of the demo's dead-weight wire test.
const DemoHangerKG = 0.5

// DemoSpeed is the time compression the demo series is timed for: each
// loading takes 80 to 105 s of test time, 16 to 21 s on the wall clock.
const DemoSpeed = 5

// DemoScript is the demo series, in the order the sim runs it: a
// 6061-T6-like aluminium bar, an annealed C11000-like copper strip, a
// cold-drawn 1018-like steel bar, a hot-rolled mild steel with a yield
// point, and a dead-weight test on annealed copper wire. A new slice on
// every call.
//
// Handbook values: 6061-T6 per the Aluminum Association typical values,
// C11000 per Smithells Metals Reference Book 8th ed. Table 22.7, 1018 per
// typical published datasheet values. The
// mild steel's values are typical of hot-rolled structural steel, from
// memory. The hardening exponents m and n, the necking onsets and drops
// and the creep constants are ours, chosen to land Rm and the elongation
// near the handbook values.
func DemoScript() []Specimen {
	return []Specimen{
		{
			ID: "OWF-2611-AL01", Shape: reduce.ShapeRound, D0MM: 6,
			L0MM: 30, LeMM: 25, LcMM: 36,
			Material: Material{
				Name: "6061-T6-like aluminium bar", Law: LawRO,
				// E 68.9 GPa, Rp0.2 276 MPa, Rm 310 MPa, A 12 %
				// (Aluminum Association typical values).
				EMPa: 68900, Rp02MPa: 276, M: 31.7,
				NeckPct: 8.5, FracturePct: 12.4, NeckDrop: 0.2,
			},
			Loading: Loading{Mode: ModeRate, CrossheadMMPerMin: 3, StiffnessNPerMM: 25000},
		},
		{
			ID: "OWF-2611-CU02", Shape: reduce.ShapeRect, A0MM: 1.0, B0MM: 12.5,
			L0MM: 50, LeMM: 50, LcMM: 60,
			Material: Material{
				Name: "C11000-like copper strip, annealed", Law: LawRO,
				// E about 117 GPa, Rp0.2 54-85 MPa, Rm 224-230 MPa,
				// elongation 50-56 % (Smithells 8th ed., Table 22.7).
				EMPa: 117000, Rp02MPa: 70, M: 4.545,
				NeckPct: 42, FracturePct: 54, NeckDrop: 0.3,
			},
			// Annealed copper bends over early: 1 mm/min through the
			// elastic range, 25 mm/min from 0.3 % on.
			Loading: Loading{Mode: ModeRate, CrossheadMMPerMin: 1, RateChangePct: 0.3,
				CrossheadAfterMMPerMin: 25, StiffnessNPerMM: 25000},
		},
		{
			ID: "OWF-2611-ST03", Shape: reduce.ShapeRound, D0MM: 12.5,
			L0MM: 50, LeMM: 50, LcMM: 60,
			Material: Material{
				Name: "1018-like steel bar, cold drawn", Law: LawRO,
				// E 205 GPa, Rp0.2 370 MPa, Rm 440 MPa, 15 % in 50 mm
				// (typical published datasheet values).
				EMPa: 205000, Rp02MPa: 370, M: 19.6,
				NeckPct: 6.2, FracturePct: 15.3, NeckDrop: 0.3,
			},
			Loading: Loading{Mode: ModeRate, CrossheadMMPerMin: 6, StiffnessNPerMM: 40000},
		},
		{
			ID: "OWF-2611-MS04", Shape: reduce.ShapeRect, A0MM: 4, B0MM: 20,
			L0MM: 50, LeMM: 50, LcMM: 60,
			Material: Material{
				Name: "mild steel flat, hot rolled", Law: LawYieldPoint,
				// Typical hot-rolled structural steel (from memory):
				// ReH about 310, ReL about 290, Ae about 2 %, Rm about
				// 420 MPa, A about 30 %.
				EMPa: 205000, ReHMPa: 310, ReLMPa: 290, AePct: 1.8,
				N: 0.16, SwiftE0: 0.02,
				NeckPct: 20, FracturePct: 32, NeckDrop: 0.3,
			},
			// The extensometer comes off at 10 %, as on many benches
			// before the neck; Rm and the break come from force and
			// crosshead.
			Loading: Loading{Mode: ModeRate, CrossheadMMPerMin: 12, StiffnessNPerMM: 40000, ExtensometerOffPct: 10},
		},
		{
			ID: "OWF-2611-WR05", Shape: reduce.ShapeRound, D0MM: 1.0,
			L0MM: 200, LeMM: 200, LcMM: 250,
			Material: Material{
				Name: "C11000-like copper wire, annealed", Law: LawRO,
				// E, Rp0.2 and Rm as the strip (Smithells 8th ed.,
				// Table 22.7); a wire's elongation is lower.
				EMPa: 117000, Rp02MPa: 70, M: 4.26,
				NeckPct: 30, FracturePct: 36, NeckDrop: 0.15,
				CreepPct: 0.3, CreepTauS: 0.5,
			},
			// Hanger 0.5 kg (hung after the tare: framed --demo sets
			// hanger_N to its weight); 1.2 kg in all stays elastic (a set
			// of about 0.6 um, below what the extensometer resolves), 3 kg
			// leaves a set of about 0.03 mm, 6 kg more; 12 and 16 kg
			// creep, 19 kg (about 186 N, above Fm of about 178 N) breaks
			// the wire.
			Loading: Loading{
				Mode: ModeDeadWeight, StiffnessNPerMM: 5000,
				SwingHz: 1.2, SwingZeta: 0.1, SwingFraction: 0.3,
				// Each weight is left long enough for the swing to die
				// out and the reading to be taken, as an operator would
				// (common practice), also at the demo's time compression.
				Steps: []WeightStep{
					{MassKG: 0.5, HoldS: 10},
					{MassKG: 1.2, HoldS: 25},
					{MassKG: 0.5, HoldS: 20},
					{MassKG: 3, HoldS: 25},
					{MassKG: 0.5, HoldS: 20},
					{MassKG: 6, HoldS: 25},
					{MassKG: 0.5, HoldS: 20},
					{MassKG: 12, HoldS: 25},
					{MassKG: 16, HoldS: 25},
					{MassKG: 19, HoldS: 10},
				},
			},
		},
	}
}
