package publish

import "github.com/eclipse/paho.mqtt.golang/packets"

// noStore is the client's session store, keeping nothing. The outbox in
// bbolt is the only record of what must still be delivered; a second,
// in-memory copy would only cause trouble: after a reconnect the client
// resends whatever it holds concurrently with the connect handler, so an
// "online" status published on connect was sent twice and could land after
// a later "offline", leaving the broker's retained status wrong. Results
// are resent from the outbox instead; status, events and live readings are
// best effort by design.
type noStore struct{}

var _ interface {
	Open()
	Put(string, packets.ControlPacket)
	Get(string) packets.ControlPacket
	All() []string
	Del(string)
	Close()
	Reset()
} = noStore{}

func (noStore) Open()                             {}
func (noStore) Put(string, packets.ControlPacket) {}
func (noStore) Get(string) packets.ControlPacket  { return nil }
func (noStore) All() []string                     { return nil }
func (noStore) Del(string)                        {}
func (noStore) Close()                            {}
func (noStore) Reset()                            {}
