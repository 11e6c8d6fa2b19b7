// Package publish hands framed's results to the lab's systems over MQTT
// and takes queued specimens back, on the topics of the design contract:
//
//	<root>/<frame>/status             retained; {"state":"online",...}, will {"state":"offline",...}
//	<root>/<frame>/events             QoS 1, best effort: one line per detected event
//	<root>/<frame>/results/<test-id>  QoS 1: the result document, from the store's outbox
//	<root>/<frame>/live               QoS 0, throttled readings, dropped while offline
//	<root>/<frame>/specimens          inbound: a lab system queues the next specimen
//
// Delivery of results is driven by the store's outbox, which is the truth:
// an item leaves the outbox only after the broker's PUBACK. The MQTT
// client keeps no session store of its own (see noStore); on every
// reconnect, and after a restart of framed, everything still in the outbox
// is sent again in order. A subscriber may therefore see a result twice and should
// de-duplicate by test_id and revision, both in the document. Nothing
// acknowledged is lost, and nothing unacknowledged is forgotten.
//
// The publisher never fails because the broker is down: it keeps
// reconnecting in the background and the outbox waits.
//
// StartEmbedded runs a broker inside framed for the single-box default.
//
// Integration tests start a real Mosquitto (package brokertest); they skip
// with a loud message when the binary is missing, and fail instead when
// FRAMED_REQUIRE_MOSQUITTO=1 (as CI should set it). FRAMED_LONG=1 repeats
// the broker-outage test ten times instead of once.
package publish
