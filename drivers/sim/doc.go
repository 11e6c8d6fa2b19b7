// Package sim is a simulated tension-test frame: a driver whose samples
// come from physics, not from a recorded file, so the whole service can
// run, be demonstrated and be tested without hardware.
//
// Each specimen is an elastic-plastic material model (Ramberg-Osgood in
// proof-strength form, Hollomon, or a yield-point steel with a Lueders
// plateau) with necking and fracture, loaded either at a constant
// crosshead rate through a load train of finite stiffness or by dead
// weights that swing after every change, leave a permanent set past the
// elastic limit, creep under load in plastic flow and break the specimen
// when they exceed what it can carry. Sensor models add noise and
// quantise to ADC or encoder counts.
//
// The material's Truth gives the properties a perfect reduction must find,
// worked out from the model, so tests can hold the reduction to them.
//
// Caveats: the models are smooth and simple. Truth's Rp0.2 uses the
// modulus E; a Ramberg-Osgood material with a low exponent m (annealed
// copper) bends over so early that the slope over the usual elastic
// window is well below E, and a reduction finds a lower apparent E and a
// slightly different Rp0.2 (the integration test accounts for this). Strain is uniform along the
// gauge length up to necking and the extensometer sees the same strain
// after it; there is no strain-rate or temperature dependence, no
// serrated flow, no bending or grip slip. Unloading is linear elastic
// with modulus E (no hysteresis). Values depend only on the sample count
// and the seed, never on the wall clock.
package sim
