package store

import (
	"errors"
	"fmt"
	"testing"
)

func TestOutboxOrderRevisionsAndDelivery(t *testing.T) {
	db, _ := openTestDB(t, Options{})
	for _, id := range []string{"A", "B"} {
		if err := db.CreateTest(TestMeta{ID: id, StartedAt: t0}); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := db.PutResult("nope", []byte(`{}`)); !errors.Is(err, ErrNotFound) {
		t.Fatalf("result of unknown test: err = %v, want ErrNotFound", err)
	}
	if _, err := db.PutResult("A", []byte(`{"broken`)); !errors.Is(err, ErrBadDocument) {
		t.Fatalf("broken JSON: err = %v, want ErrBadDocument", err)
	}
	put := func(id string, wantRev int) {
		t.Helper()
		next, err := db.NextRevision(id)
		if err != nil || next != wantRev {
			t.Fatalf("NextRevision(%s) = %d, %v; want %d", id, next, err, wantRev)
		}
		rev, err := db.PutResult(id, []byte(fmt.Sprintf(`{"test_id":%q,"revision":%d}`, id, wantRev)))
		if err != nil || rev != wantRev {
			t.Fatalf("PutResult(%s) = %d, %v; want revision %d", id, rev, err, wantRev)
		}
	}
	put("A", 1)
	put("B", 1)
	put("A", 2)

	items, err := db.OutboxPending(10)
	if err != nil {
		t.Fatal(err)
	}
	var order []string
	for _, it := range items {
		order = append(order, fmt.Sprintf("%s/%d", it.TestID, it.Revision))
		if want := fmt.Sprintf(`{"test_id":%q,"revision":%d}`, it.TestID, it.Revision); string(it.Doc) != want {
			t.Errorf("doc %s, want %s", it.Doc, want)
		}
	}
	if fmt.Sprint(order) != "[A/1 B/1 A/2]" {
		t.Fatalf("outbox order %v", order)
	}
	if items, _ := db.OutboxPending(2); len(items) != 2 {
		t.Fatalf("OutboxPending(2) gave %d", len(items))
	}
	doc, rev, err := db.Result("A")
	if err != nil || rev != 2 || string(doc) != `{"test_id":"A","revision":2}` {
		t.Fatalf("Result(A) = %s, %d, %v", doc, rev, err)
	}

	if err := db.DeleteTest("A"); !errors.Is(err, ErrNotDelivered) {
		t.Fatalf("delete undelivered: err = %v, want ErrNotDelivered", err)
	}
	if err := db.OutboxDone(items[0].Seq); err != nil {
		t.Fatal(err)
	}
	if err := db.OutboxDone(items[0].Seq); !errors.Is(err, ErrNotFound) {
		t.Fatalf("second done: err = %v, want ErrNotFound", err)
	}
	if d := db.Delivered("A"); d != 1 {
		t.Fatalf("Delivered(A) = %d after revision 1 acked", d)
	}
	if err := db.DeleteTest("A"); !errors.Is(err, ErrNotDelivered) {
		t.Fatalf("delete with revision 2 pending: err = %v, want ErrNotDelivered", err)
	}
	if err := db.OutboxDone(items[2].Seq); err != nil {
		t.Fatal(err)
	}
	if err := db.DeleteTest("A"); err != nil {
		t.Fatalf("delete delivered: %v", err)
	}
	if _, err := db.Test("A"); !errors.Is(err, ErrNotFound) {
		t.Fatalf("deleted test still there: %v", err)
	}
	if n, _ := db.OutboxLen(); n != 1 {
		t.Fatalf("outbox holds %d, want B's one", n)
	}
}

func TestOutboxFullKeepsResult(t *testing.T) {
	db, _ := openTestDB(t, Options{OutboxMax: 2})
	for _, id := range []string{"A", "B", "C"} {
		if err := db.CreateTest(TestMeta{ID: id, StartedAt: t0}); err != nil {
			t.Fatal(err)
		}
	}
	for _, id := range []string{"A", "B"} {
		if _, err := db.PutResult(id, []byte(`{}`)); err != nil {
			t.Fatal(err)
		}
	}
	rev, err := db.PutResult("C", []byte(`{"c":1}`))
	if !errors.Is(err, ErrOutboxFull) || rev != 1 {
		t.Fatalf("PutResult on full outbox = %d, %v; want 1, ErrOutboxFull", rev, err)
	}
	if doc, _, err := db.Result("C"); err != nil || string(doc) != `{"c":1}` {
		t.Fatalf("result not kept: %s, %v", doc, err)
	}
	if err := db.Requeue("C"); !errors.Is(err, ErrOutboxFull) {
		t.Fatalf("requeue while full: %v", err)
	}
	items, _ := db.OutboxPending(10)
	if err := db.OutboxDone(items[0].Seq); err != nil {
		t.Fatal(err)
	}
	if err := db.Requeue("C"); err != nil {
		t.Fatal(err)
	}
	if err := db.Requeue("C"); err != nil { // already waiting: no duplicate
		t.Fatal(err)
	}
	items, _ = db.OutboxPending(10)
	if len(items) != 2 || items[1].TestID != "C" {
		t.Fatalf("after requeue: %+v", items)
	}
	if err := db.DeleteTest("C"); !errors.Is(err, ErrNotDelivered) {
		t.Fatalf("delete: err = %v, want ErrNotDelivered", err)
	}
}
