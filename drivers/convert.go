package drivers

import (
	"time"

	"framed/proto/driverpb"
)

// All conversions between the plain driver types and the generated proto
// types live in this file. Sample columns are handed over as slices, never
// copied element by element: a batch costs a few allocations whatever its
// length, which keeps the shims far above a million samples per second.

func infoToProto(in Info) *driverpb.Info {
	out := &driverpb.Info{
		Driver:       in.Driver,
		Version:      in.Version,
		SampleRateHz: in.SampleRateHz,
		Channels:     make([]*driverpb.Channel, len(in.Channels)),
	}
	for i, c := range in.Channels {
		out.Channels[i] = &driverpb.Channel{
			Name:       c.Name,
			Quantity:   string(c.Quantity),
			Unit:       c.Unit,
			RangeMax:   c.RangeMax,
			Resolution: c.Resolution,
		}
	}
	return out
}

func infoFromProto(in *driverpb.Info) Info {
	if in == nil {
		return Info{}
	}
	out := Info{
		Driver:       in.GetDriver(),
		Version:      in.GetVersion(),
		SampleRateHz: in.GetSampleRateHz(),
	}
	if len(in.GetChannels()) > 0 {
		out.Channels = make([]Channel, len(in.GetChannels()))
	}
	for i, c := range in.GetChannels() {
		out.Channels[i] = Channel{
			Name:       c.GetName(),
			Quantity:   Quantity(c.GetQuantity()),
			Unit:       c.GetUnit(),
			RangeMax:   c.GetRangeMax(),
			Resolution: c.GetResolution(),
		}
	}
	return out
}

// batchToProto shares b's slices with the message; the caller must not
// change them until the message is sent. Err is not carried here: it ends
// the call as a status (see errorcodes.go).
func batchToProto(b Batch) *driverpb.SampleBatch {
	out := &driverpb.SampleBatch{
		Seq:         b.Seq,
		TimeNs:      b.TimeNS,
		GapBeforeNs: int64(b.GapBefore),
		Columns:     make([]*driverpb.Column, len(b.Values)),
	}
	cols := make([]driverpb.Column, len(b.Values))
	for i, v := range b.Values {
		cols[i].Values = v
		out.Columns[i] = &cols[i]
	}
	return out
}

// batchFromProto takes over the message's slices.
func batchFromProto(in *driverpb.SampleBatch) Batch {
	out := Batch{
		Seq:       in.GetSeq(),
		TimeNS:    in.GetTimeNs(),
		GapBefore: time.Duration(in.GetGapBeforeNs()),
		Values:    make([][]float64, len(in.GetColumns())),
	}
	for i, c := range in.GetColumns() {
		out.Values[i] = c.GetValues()
	}
	return out
}

func healthToProto(h Health) *driverpb.HealthResponse {
	return &driverpb.HealthResponse{Ok: h.OK, Message: h.Message, Counters: h.Counters}
}

func healthFromProto(in *driverpb.HealthResponse) Health {
	return Health{OK: in.GetOk(), Message: in.GetMessage(), Counters: in.GetCounters()}
}
