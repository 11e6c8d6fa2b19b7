package publish

import "sync"

// The latest force verification of the frame is published retained on
// <root>/<frame>/verification, so a lab system that connects at any time
// sees which ISO 7500-1 class the frame's force channel last met, and
// when. It is sent again on every connection: the store keeps the
// history, the broker only the latest.

// lastVerification is the document published and re-sent on reconnect.
type lastVerification struct {
	mu  sync.Mutex
	doc []byte
}

// Verification publishes a verification report (compact JSON), retained.
func (p *Publisher) Verification(doc []byte) {
	doc = compactJSON(doc)
	p.verif.mu.Lock()
	p.verif.doc = doc
	p.verif.mu.Unlock()
	if p.client != nil && p.connected() {
		p.client.Publish(p.topics.verification, 1, true, doc)
	}
}

// resendVerification republishes the latest report after a (re)connect.
func (p *Publisher) resendVerification() {
	p.verif.mu.Lock()
	doc := p.verif.doc
	p.verif.mu.Unlock()
	if doc != nil {
		p.client.Publish(p.topics.verification, 1, true, doc)
	}
}
