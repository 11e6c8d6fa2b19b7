package daemon

import (
	"fmt"
	"sync"

	"framed/reduce"
)

// maxQueuedSpecimens bounds the queue a lab system can fill.
const maxQueuedSpecimens = 256

// specimenQueue holds the metadata of the next specimens, in the order the
// lab system (or the operator) queued them. The test that starts next takes
// the head; with an empty queue it takes the fallback (the configured
// default specimen, or in the demo the next specimen of the script).
type specimenQueue struct {
	mu       sync.Mutex
	q        []reduce.Specimen
	fallback func() (reduce.Specimen, bool)
}

func (s *specimenQueue) push(sp reduce.Specimen) error {
	s.mu.Lock()
	defer s.mu.Unlock()
	if len(s.q) >= maxQueuedSpecimens {
		return fmt.Errorf("specimen queue full (%d): the frame has not run the ones queued", maxQueuedSpecimens)
	}
	s.q = append(s.q, sp)
	return nil
}

func (s *specimenQueue) pop() (reduce.Specimen, bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if len(s.q) > 0 {
		sp := s.q[0]
		s.q = s.q[1:]
		return sp, true
	}
	if s.fallback != nil {
		return s.fallback()
	}
	return reduce.Specimen{}, false
}

func (s *specimenQueue) list() []reduce.Specimen {
	s.mu.Lock()
	defer s.mu.Unlock()
	return append([]reduce.Specimen(nil), s.q...)
}
