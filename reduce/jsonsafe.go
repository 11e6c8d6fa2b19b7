package reduce

import (
	"encoding/json"
	"math"
)

// JSON cannot carry NaN or infinity, and a hold on a frame without an
// extensometer has no extension: such values are written as null rather
// than make the whole document unencodable (and the result undeliverable).

func num(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// MarshalJSON writes non-finite values as null.
func (h Hold) MarshalJSON() ([]byte, error) {
	return json.Marshal(struct {
		StartS          *float64 `json:"start_s"`
		SettledS        *float64 `json:"settled_s"`
		EndS            *float64 `json:"end_s"`
		ForceN          *float64 `json:"force_N"`
		ExtensionMM     *float64 `json:"extension_mm"`
		CreepMMPerS     *float64 `json:"creep_mm_per_s"`
		RelaxationNPerS *float64 `json:"relaxation_N_per_s"`
	}{num(h.StartS), num(h.SettledS), num(h.EndS), num(h.ForceN), num(h.ExtensionMM), num(h.CreepMMPerS), num(h.RelaxationNPerS)})
}

// UnmarshalJSON reads null as NaN.
func (h *Hold) UnmarshalJSON(b []byte) error {
	var v struct {
		StartS          *float64 `json:"start_s"`
		SettledS        *float64 `json:"settled_s"`
		EndS            *float64 `json:"end_s"`
		ForceN          *float64 `json:"force_N"`
		ExtensionMM     *float64 `json:"extension_mm"`
		CreepMMPerS     *float64 `json:"creep_mm_per_s"`
		RelaxationNPerS *float64 `json:"relaxation_N_per_s"`
	}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	*h = Hold{val(v.StartS), val(v.SettledS), val(v.EndS), val(v.ForceN), val(v.ExtensionMM), val(v.CreepMMPerS), val(v.RelaxationNPerS)}
	return nil
}

// MarshalJSON writes non-finite values as null.
func (u Unload) MarshalJSON() ([]byte, error) {
	return json.Marshal(struct {
		TimeS       *float64 `json:"time_s"`
		AfterForceN *float64 `json:"after_force_N"`
		SetMM       *float64 `json:"set_mm"`
	}{num(u.TimeS), num(u.AfterForceN), num(u.SetMM)})
}

// UnmarshalJSON reads null as NaN.
func (u *Unload) UnmarshalJSON(b []byte) error {
	var v struct {
		TimeS       *float64 `json:"time_s"`
		AfterForceN *float64 `json:"after_force_N"`
		SetMM       *float64 `json:"set_mm"`
	}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	*u = Unload{val(v.TimeS), val(v.AfterForceN), val(v.SetMM)}
	return nil
}

func val(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}

// Finite drops quantities whose value is not a finite number and clears
// non-finite uncertainties and event forces, flagging what it dropped, so
// the document always encodes. Reduce never produces such values by
// design; this is the last guard before publishing.
func (r *Result) Finite() {
	qs := r.Quantities[:0]
	for _, q := range r.Quantities {
		if num(q.Value) == nil {
			r.Flags = append(r.Flags, "dropped-non-finite-"+q.Symbol)
			continue
		}
		if q.U != nil && num(*q.U) == nil {
			q.U = nil
		}
		qs = append(qs, q)
	}
	r.Quantities = qs
	for i := range r.Events {
		if e := &r.Events[i]; e.ForceN != nil && num(*e.ForceN) == nil {
			e.ForceN = nil
		}
		if num(r.Events[i].TimeS) == nil {
			r.Events[i].TimeS = 0
		}
	}
	if el := r.ElasticLimit; el != nil {
		if el.NoSetUpToN != nil && num(*el.NoSetUpToN) == nil {
			el.NoSetUpToN = nil
		}
		if el.SetFromN != nil && num(*el.SetFromN) == nil {
			el.SetFromN = nil
		}
	}
	if f := r.Fit; f != nil {
		for _, p := range []*float64{&f.FromMPa, &f.ToMPa, &f.R2, &f.V1Pct} {
			if num(*p) == nil {
				*p = 0
			}
		}
	}
}
