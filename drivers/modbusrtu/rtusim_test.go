package modbusrtu

import (
	"sync"
	"testing"
	"time"

	"framed/drivers/serialtest"
)

// crc16 is the Modbus RTU CRC (reflected polynomial 0xA001, initial
// 0xFFFF), sent low byte first. Written here independently of the
// library under test so the simulator checks the library's framing.
func crc16(b []byte) uint16 {
	crc := uint16(0xFFFF)
	for _, c := range b {
		crc ^= uint16(c)
		for range 8 {
			if crc&1 != 0 {
				crc = crc>>1 ^ 0xA001
			} else {
				crc >>= 1
			}
		}
	}
	return crc
}

var debugSim = false

// simFault is what the simulator does with one request.
type simFault int

const (
	simAnswer    simFault = iota
	simBadCRC             // answer with a corrupted CRC
	simSilent             // no answer: the master times out
	simException          // exception 0x02, illegal data address
)

// rtuSim is a Modbus RTU slave on the master end of a pty. It answers
// function 3 and 4 requests from its register maps and can be told to
// corrupt or drop answers.
type rtuSim struct {
	pty     *serialtest.Pty
	slaveID byte

	mu       sync.Mutex
	holding  map[uint16]uint16
	input    map[uint16]uint16
	faults   map[byte][]simFault // by function code, one per request; empty = answer
	requests int
	badReqs  int // requests with a bad CRC or unknown function
}

func startSim(t *testing.T, slaveID byte) *rtuSim {
	s := &rtuSim{pty: serialtest.OpenPty(t), slaveID: slaveID,
		holding: map[uint16]uint16{}, input: map[uint16]uint16{}, faults: map[byte][]simFault{}}
	stop := make(chan struct{})
	done := make(chan struct{})
	go s.serve(stop, done)
	t.Cleanup(func() {
		close(stop)
		s.pty.Unplug() // unblocks a pending read
		<-done
	})
	return s
}

// setFaults queues faults for the next requests of function fc.
func (s *rtuSim) setFaults(fc byte, f ...simFault) {
	s.mu.Lock()
	s.faults[fc] = append(s.faults[fc], f...)
	s.mu.Unlock()
}

// pendingFaults is how many queued faults are not yet applied.
func (s *rtuSim) pendingFaults() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return len(s.faults[3]) + len(s.faults[4])
}

func (s *rtuSim) set(input bool, addr uint16, regs ...uint16) {
	s.mu.Lock()
	m := s.holding
	if input {
		m = s.input
	}
	for i, r := range regs {
		m[addr+uint16(i)] = r
	}
	s.mu.Unlock()
}

func (s *rtuSim) stats() (requests, bad int) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.requests, s.badReqs
}

// serve reads 8-byte read requests from the master end and answers them.
// It survives unplug and replug: it always reads from the current master.
func (s *rtuSim) serve(stop, done chan struct{}) {
	defer close(done)
	var buf []byte
	chunk := make([]byte, 256)
	for {
		select {
		case <-stop:
			return
		default:
		}
		m := s.pty.Master()
		if m == nil {
			buf = buf[:0]
			time.Sleep(5 * time.Millisecond)
			continue
		}
		m.SetReadDeadline(time.Now().Add(20 * time.Millisecond))
		n, err := m.Read(chunk)
		buf = append(buf, chunk[:n]...)
		if err != nil && n == 0 {
			if s.pty.Master() != m { // unplugged: drop the half request
				buf = buf[:0]
			}
			continue
		}
		for len(buf) >= 8 {
			req := buf[:8]
			if crc16(req[:6]) != uint16(req[6])|uint16(req[7])<<8 || (req[1] != 3 && req[1] != 4) {
				// Out of step: drop one byte and look again, as a slave
				// resynchronising on the inter-frame silence would.
				s.mu.Lock()
				s.badReqs++
				s.mu.Unlock()
				buf = buf[1:]
				continue
			}
			s.answer(m, req)
			buf = buf[8:]
		}
	}
}

func (s *rtuSim) answer(m interface{ Write([]byte) (int, error) }, req []byte) {
	s.mu.Lock()
	s.requests++
	fault := simAnswer
	if q := s.faults[req[1]]; len(q) > 0 {
		fault = q[0]
		s.faults[req[1]] = q[1:]
	}
	regs := s.holding
	if req[1] == 4 {
		regs = s.input
	}
	addr := uint16(req[2])<<8 | uint16(req[3])
	count := uint16(req[4])<<8 | uint16(req[5])
	resp := []byte{req[0], req[1], byte(2 * count)}
	for i := range count {
		v := regs[addr+i]
		resp = append(resp, byte(v>>8), byte(v))
	}
	s.mu.Unlock()
	if debugSim {
		println("sim", time.Now().Format("05.000000"), "req", req[1], "fault", fault)
	}
	if req[0] != s.slaveID || fault == simSilent {
		return
	}
	if fault == simException {
		resp = []byte{req[0], req[1] | 0x80, 0x02}
	}
	crc := crc16(resp)
	resp = append(resp, byte(crc), byte(crc>>8))
	if fault == simBadCRC {
		resp[len(resp)-1] ^= 0x5A
	}
	m.Write(resp)
}
