package publish

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/reduce"
)

// DecodeSpecimen parses one specimen message strictly: at most maxBytes,
// exactly one JSON object with only reduce.Specimen's fields, an id, a
// known shape, and no negative or non-finite dimension. Refusals wrap
// ErrBadSpecimen and say why.
func DecodeSpecimen(payload []byte, maxBytes int) (reduce.Specimen, error) {
	var s reduce.Specimen
	if len(payload) > maxBytes {
		return s, fmt.Errorf("%w: %d bytes, limit %d", ErrBadSpecimen, len(payload), maxBytes)
	}
	dec := json.NewDecoder(bytes.NewReader(payload))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&s); err != nil {
		return reduce.Specimen{}, fmt.Errorf("%w: %v", ErrBadSpecimen, err)
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		return reduce.Specimen{}, fmt.Errorf("%w: data after the JSON object", ErrBadSpecimen)
	}
	if s.ID == "" {
		return reduce.Specimen{}, fmt.Errorf("%w: no id", ErrBadSpecimen)
	}
	switch s.Shape {
	case "", reduce.ShapeRound, reduce.ShapeRect, reduce.ShapeTube, reduce.ShapeWire:
	default:
		return reduce.Specimen{}, fmt.Errorf("%w: unknown shape %q", ErrBadSpecimen, s.Shape)
	}
	dims := []struct {
		name string
		v    float64
	}{
		{"d0_mm", s.D0MM}, {"a0_mm", s.A0MM}, {"b0_mm", s.B0MM}, {"D0_mm", s.OuterD0MM},
		{"mass_g", s.MassG}, {"Lt_mm", s.TotalLengthMM}, {"density_g_per_cm3", s.DensityGPerCM3},
		{"S0_mm2", s.S0MM2}, {"L0_mm", s.L0MM}, {"Le_mm", s.LeMM}, {"Lu_mm", s.LuMM},
		{"Su_mm2", s.SuMM2}, {"du_mm", s.DuMM},
	}
	for _, d := range dims {
		if d.v < 0 || math.IsInf(d.v, 0) || math.IsNaN(d.v) {
			return reduce.Specimen{}, fmt.Errorf("%w: %s = %v", ErrBadSpecimen, d.name, d.v)
		}
	}
	return s, nil
}

// onSpecimen runs on the client's goroutine: it must never block or
// panic. A full queue refuses the newest message.
func (p *Publisher) onSpecimen(_ mqtt.Client, m mqtt.Message) {
	s, err := DecodeSpecimen(m.Payload(), p.cfg.MaxSpecimenBytes)
	if err != nil {
		p.stats.specimensRejected.Add(1)
		p.log.Warn("specimen message rejected", "topic", m.Topic(), "reason", err.Error())
		return
	}
	select {
	case p.specimens <- s:
		p.stats.specimensAccepted.Add(1)
		p.log.Info("specimen queued", "id", s.ID)
	default:
		p.stats.specimensRejected.Add(1)
		p.log.Warn("specimen message rejected", "id", s.ID, "reason", "queue full: nobody is taking specimens")
	}
}
