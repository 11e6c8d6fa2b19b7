package detectgen

// Wire is our stepped dead-weight scenario: a hard-drawn steel wire,
// 1 mm in diameter and 1 m long (stiffness E·S/L ≈ 200 GPa × 0.785 mm² /
// 1000 mm ≈ 157 N/mm, handbook E of steel), on a 1 kN load cell. Weights
// go on and come off by hand in load-unload cycles; the elastic limit is
// at 470 N (about 600 MPa), so the cycles up to 400 N leave no set and the
// one to 500 N does; under 550 and 600 N the wire creeps, and it breaks
// on the final 650 N.
func Wire(rateHz float64, seed uint64) Stepped {
	return Stepped{
		RateHz: rateHz,
		IdleS:  3,
		Levels: []Level{
			{100, 10}, {200, 10}, {0, 8},
			{300, 10}, {400, 10}, {0, 8},
			{500, 12}, {0, 8},
			{550, 12}, {600, 14}, {650, 0},
		},
		StiffnessNPerMM: 157,
		ElasticLimitN:   470,
		HardeningNPerMM: 300,
		CreepMM:         0.2,
		CreepTauS:       2,
		ChangeS:         0.4,
		SwingHz:         3,
		SwingDamping:    0.15,
		SwingFraction:   0.5,
		Break:           true,
		BreakAfterS:     8,
		AfterBreakS:     1,
		Sensor:          BridgeBoard(1000),
		Seed:            seed,
	}
}
