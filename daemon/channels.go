package daemon

import (
	"encoding/json"
	"fmt"
	"strings"

	"framed/drivers"
	"framed/reduce"
)

// mapChannels resolves the frame's signals to driver channels: an explicit
// "driver/channel" from the config, else the first channel of the right
// quantity across the drivers in order. Force is required.
func mapChannels(cm ChannelMap, dcs []DriverConfig, infos []drivers.Info) ([nSignals]source, error) {
	var out [nSignals]source
	refs := [nSignals]string{cm.Force, cm.Extension, cm.Crosshead}
	quantities := [nSignals]drivers.Quantity{drivers.QuantityForce, drivers.QuantityExtension, drivers.QuantityCrosshead}
	for s := range nSignals {
		out[s] = source{-1, -1}
		if refs[s] != "" {
			drv, ch, _ := strings.Cut(refs[s], "/")
			found := false
			for i, dc := range dcs {
				if dc.Name != drv {
					continue
				}
				for j, c := range infos[i].Channels {
					if c.Name == ch {
						out[s], found = source{i, j}, true
					}
				}
				if !found {
					return out, fmt.Errorf("%w: channels.%s %q: driver %q has channels %s", ErrNoChannel, signalNames[s], refs[s], drv, channelNames(infos[i]))
				}
			}
			continue
		}
		for i := range infos {
			for j, c := range infos[i].Channels {
				if c.Quantity == quantities[s] && out[s].driver < 0 {
					out[s] = source{i, j}
				}
			}
		}
	}
	if out[sigForce].driver < 0 {
		return out, fmt.Errorf("%w: no driver offers a force channel; set channels.force to \"driver/channel\"", ErrNoChannel)
	}
	return out, nil
}

func channelNames(in drivers.Info) string {
	var names []string
	for _, c := range in.Channels {
		names = append(names, fmt.Sprintf("%q", c.Name))
	}
	if len(names) == 0 {
		return "none"
	}
	return strings.Join(names, ", ")
}

func unmarshalSpecimen(b []byte, sp *reduce.Specimen) error {
	return json.Unmarshal(b, sp)
}
