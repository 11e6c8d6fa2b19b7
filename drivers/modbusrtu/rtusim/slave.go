package rtusim

import (
	"fmt"
	"sync"
)

// Fault is what the slave does with one request instead of answering it
// normally. Tests queue faults to see how a master copes.
type Fault int

const (
	// Answer normally.
	Answer Fault = iota
	// BadCRC answers with a corrupted CRC.
	BadCRC
	// Silent does not answer: the master times out.
	Silent
	// Exception answers exception 0x02, illegal data address.
	Exception
)

// Function codes the slave answers.
const (
	ReadHolding byte = 3
	ReadInput   byte = 4
)

// Slave holds the register maps of one simulated RTU device. All methods
// are safe for concurrent use, so one goroutine can serve the line while
// another moves the simulated load.
type Slave struct {
	id byte

	mu       sync.Mutex
	holding  map[uint16]uint16
	input    map[uint16]uint16
	faults   map[byte][]Fault // by function code, one per request
	requests int
	badReqs  int
}

// NewSlave returns a slave answering to address id (1..247), every
// register zero.
func NewSlave(id int) (*Slave, error) {
	if id < 1 || id > 247 {
		return nil, fmt.Errorf("%w: got %d", ErrBadSlaveID, id)
	}
	return &Slave{id: byte(id), holding: map[uint16]uint16{}, input: map[uint16]uint16{}, faults: map[byte][]Fault{}}, nil
}

// ID is the slave's address.
func (s *Slave) ID() byte { return s.id }

// SetHolding writes regs into the holding registers from addr on.
func (s *Slave) SetHolding(addr uint16, regs ...uint16) { s.set(s.holding, addr, regs) }

// SetInput writes regs into the input registers from addr on.
func (s *Slave) SetInput(addr uint16, regs ...uint16) { s.set(s.input, addr, regs) }

func (s *Slave) set(m map[uint16]uint16, addr uint16, regs []uint16) {
	s.mu.Lock()
	for i, r := range regs {
		m[addr+uint16(i)] = r
	}
	s.mu.Unlock()
}

// QueueFaults queues faults for the next requests of function fc, one
// fault per request, in order.
func (s *Slave) QueueFaults(fc byte, f ...Fault) {
	s.mu.Lock()
	s.faults[fc] = append(s.faults[fc], f...)
	s.mu.Unlock()
}

// PendingFaults is how many queued faults are not yet applied.
func (s *Slave) PendingFaults() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	n := 0
	for _, q := range s.faults {
		n += len(q)
	}
	return n
}

// Stats returns how many well-formed requests were seen (to any address)
// and how many bytes were skipped as out of step: bad CRCs, unknown
// functions, line noise.
func (s *Slave) Stats() (requests, bad int) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.requests, s.badReqs
}

// requestLen is the length of a function 3 or 4 request: address,
// function, start (2), count (2), CRC (2).
const requestLen = 8

// Feed takes bytes received so far and returns the answers to the
// complete requests among them (nil for a request that gets no answer:
// another address, or a Silent fault) and the bytes left over, which
// belong to the next call. It is the whole protocol, without I/O, so it
// can be tested byte for byte.
func (s *Slave) Feed(buf []byte) (answers [][]byte, rest []byte) {
	for len(buf) >= requestLen {
		req := buf[:requestLen]
		if CRC16(req[:6]) != uint16(req[6])|uint16(req[7])<<8 || (req[1] != ReadHolding && req[1] != ReadInput) {
			// Out of step: drop one byte and look again, as a slave
			// resynchronising on the inter-frame silence would.
			s.mu.Lock()
			s.badReqs++
			s.mu.Unlock()
			buf = buf[1:]
			continue
		}
		if resp := s.answer(req); resp != nil {
			answers = append(answers, resp)
		}
		buf = buf[requestLen:]
	}
	return answers, buf
}

// maxReadCount is the largest register count one read may ask for
// (Modbus application protocol: 125 registers for functions 3 and 4).
const maxReadCount = 125

func (s *Slave) answer(req []byte) []byte {
	s.mu.Lock()
	s.requests++
	fault := Answer
	if req[0] == s.id {
		if q := s.faults[req[1]]; len(q) > 0 {
			fault = q[0]
			s.faults[req[1]] = q[1:]
		}
	}
	regs := s.holding
	if req[1] == ReadInput {
		regs = s.input
	}
	addr := uint16(req[2])<<8 | uint16(req[3])
	count := uint16(req[4])<<8 | uint16(req[5])
	var resp []byte
	if count >= 1 && count <= maxReadCount {
		resp = make([]byte, 0, 5+2*int(count))
		resp = append(resp, req[0], req[1], byte(2*count))
		for i := range count {
			v := regs[addr+i]
			resp = append(resp, byte(v>>8), byte(v))
		}
	}
	s.mu.Unlock()
	if req[0] != s.id || fault == Silent {
		return nil
	}
	if resp == nil {
		// exception 0x03, illegal data value: a count of 0 or over 125.
		resp = []byte{req[0], req[1] | 0x80, 0x03}
	}
	if fault == Exception {
		resp = []byte{req[0], req[1] | 0x80, 0x02}
	}
	resp = AppendCRC(resp)
	if fault == BadCRC {
		resp[len(resp)-1] ^= 0x5A
	}
	return resp
}
