package publish

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"time"

	"framed/daemon/store"
)

// Notify wakes the delivery loop: call it after the store took a new
// result. It never blocks.
func (p *Publisher) Notify() {
	select {
	case p.notify <- struct{}{}:
	default:
	}
}

// deliver drains the outbox in order, one result at a time: an item is
// marked done only after its PUBACK, and the next one is sent only then,
// so results arrive in the order they were stored. A lost connection or a
// missing PUBACK sends the same item again after reconnecting.
func (p *Publisher) deliver(ctx context.Context) {
	const batch = 16
	for {
		up, lost := p.connection()
		select {
		case <-ctx.Done():
			return
		case <-up:
		}
		items, err := p.db.OutboxPending(batch)
		if err != nil {
			p.log.Error("reading outbox", "err", err)
			if !p.sleep(ctx, time.Second) {
				return
			}
			continue
		}
		if len(items) == 0 {
			select {
			case <-ctx.Done():
				return
			case <-p.notify:
			case <-lost:
			}
			continue
		}
		for _, it := range items {
			if !p.deliverOne(ctx, lost, it) {
				break
			}
		}
	}
}

// deliverOne publishes one item and waits for its PUBACK. It reports
// whether to go on with the next item.
func (p *Publisher) deliverOne(ctx context.Context, lost chan struct{}, it store.OutboxItem) bool {
	payload := compactJSON(it.Doc)
	tok := p.client.Publish(p.topics.result(it.TestID), 1, false, payload)
	timer := time.NewTimer(p.cfg.AckTimeout)
	defer timer.Stop()
	select {
	case <-ctx.Done():
		return false
	case <-lost:
		return false
	case <-timer.C:
		p.log.Warn("no PUBACK for result, will resend", "test_id", it.TestID, "revision", it.Revision)
		return false
	case <-tok.Done():
	}
	if err := tok.Error(); err != nil {
		p.log.Warn("publishing result failed, will resend", "test_id", it.TestID, "revision", it.Revision, "err", err)
		p.sleep(ctx, 200*time.Millisecond)
		return false
	}
	if err := p.db.OutboxDone(it.Seq); err != nil && !errors.Is(err, store.ErrNotFound) {
		p.log.Error("marking result delivered", "test_id", it.TestID, "revision", it.Revision, "err", err)
		p.sleep(ctx, time.Second) // a broken store must not turn into a resend storm
		return false
	}
	p.stats.resultsAcked.Add(1)
	p.log.Info("result delivered", "test_id", it.TestID, "revision", it.Revision)
	return true
}

func (p *Publisher) sleep(ctx context.Context, d time.Duration) bool {
	t := time.NewTimer(d)
	defer t.Stop()
	select {
	case <-ctx.Done():
		return false
	case <-t.C:
		return true
	}
}

// compactJSON makes a payload one line, as the contract wants. The store
// only keeps valid JSON, so compaction cannot fail; if it did, the document
// is sent as stored rather than held back.
func compactJSON(doc []byte) []byte {
	var b bytes.Buffer
	if err := json.Compact(&b, doc); err != nil {
		return doc
	}
	return b.Bytes()
}
