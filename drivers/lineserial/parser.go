package lineserial

import (
	"bytes"
	"math"
)

// Sample is one parsed line.
type Sample struct {
	// Values holds one value per configured channel, in Unit; NaN when the
	// board sent NaN text or a count outside the converter's range.
	Values []float64
	// BoardTime is the raw board counter (when a time field is configured).
	BoardTime    uint64
	HasBoardTime bool
	// NaNs and OutOfRange count the channels of this line that became NaN
	// for each reason.
	NaNs       int
	OutOfRange int
}

// slot kinds of a field.
const (
	slotSkip = -1
	slotTime = -2
)

type chanConv struct {
	lo, hi, scale, offset float64
}

// Parser turns one line (without its newline) into a Sample. It keeps no
// state between lines and allocates nothing per line, so one parser can
// keep up with far more than a 1 kHz board.
type Parser struct {
	keyvalue bool
	delim    byte
	collapse bool // a space delimiter: runs of spaces are one separator
	checksum bool
	timeMask uint64
	// delimited: slot of each position.
	posSlot []int
	// keyvalue: configured keys and their slots; seen is scratch.
	keys    []string
	keySlot []int
	seen    []bool
	chans   []chanConv
}

// NewParser builds the parser of a validated configuration.
func NewParser(c Config) *Parser {
	p := &Parser{
		keyvalue: c.Format == "keyvalue",
		delim:    c.Delimiter[0],
		checksum: c.Checksum == "xor",
		timeMask: math.MaxUint64 >> (64 - c.TimeBits),
	}
	p.collapse = p.delim == ' '
	slotOf := func(field string) int {
		if field == c.TimeField && field != "" {
			return slotTime
		}
		for i, ch := range c.Channels {
			if ch.Field == field {
				return i
			}
		}
		return slotSkip
	}
	if p.keyvalue {
		if c.TimeField != "" {
			p.keys = append(p.keys, c.TimeField)
			p.keySlot = append(p.keySlot, slotTime)
		}
		for i, ch := range c.Channels {
			p.keys = append(p.keys, ch.Field)
			p.keySlot = append(p.keySlot, i)
		}
		p.seen = make([]bool, len(p.keys))
	} else {
		for _, f := range c.Fields {
			p.posSlot = append(p.posSlot, slotOf(f))
		}
	}
	for _, ch := range c.Channels {
		lo, hi := ch.rawLimits()
		p.chans = append(p.chans, chanConv{lo: lo, hi: hi, scale: *ch.Scale, offset: ch.Offset})
	}
	return p
}

// Channels is the number of values a Sample carries.
func (p *Parser) Channels() int { return len(p.chans) }

// Parse fills s from line. It returns ErrGarbled or ErrChecksum for a line
// to drop; NaN and out-of-range readings are not errors, they are counted
// in s and leave NaN in that channel.
func (p *Parser) Parse(line []byte, s *Sample) error {
	if n := len(line); n > 0 && line[n-1] == '\r' {
		line = line[:n-1]
	}
	if p.checksum {
		body, err := splitChecksum(line)
		if err != nil {
			return err
		}
		line = body
	}
	if cap(s.Values) < len(p.chans) {
		s.Values = make([]float64, len(p.chans))
	}
	s.Values = s.Values[:len(p.chans)]
	s.HasBoardTime, s.BoardTime, s.NaNs, s.OutOfRange = false, 0, 0, 0
	if p.keyvalue {
		return p.parseKeyValue(line, s)
	}
	return p.parseDelimited(line, s)
}

// nextToken splits off the next field of line.
func (p *Parser) nextToken(line []byte) (tok, rest []byte, ok bool) {
	if p.collapse {
		for len(line) > 0 && line[0] == ' ' {
			line = line[1:]
		}
		if len(line) == 0 {
			return nil, nil, false
		}
	}
	if i := bytes.IndexByte(line, p.delim); i >= 0 {
		return line[:i], line[i+1:], true
	}
	return line, nil, true
}

func (p *Parser) parseDelimited(line []byte, s *Sample) error {
	pos := 0
	for rest, more := line, true; more; {
		var tok []byte
		var ok bool
		tok, rest, ok = p.nextToken(rest)
		if !ok {
			break
		}
		more = rest != nil
		if pos >= len(p.posSlot) {
			return ErrGarbled
		}
		if err := p.store(p.posSlot[pos], tok, s); err != nil {
			return err
		}
		pos++
	}
	if pos != len(p.posSlot) {
		return ErrGarbled
	}
	return nil
}

func (p *Parser) parseKeyValue(line []byte, s *Sample) error {
	clear(p.seen)
	for rest, more := line, true; more; {
		var tok []byte
		var ok bool
		tok, rest, ok = p.nextToken(rest)
		if !ok {
			break
		}
		more = rest != nil
		eq := bytes.IndexByte(tok, '=')
		if eq <= 0 {
			return ErrGarbled
		}
		key := tok[:eq]
		for j, k := range p.keys {
			if string(key) == k {
				if p.seen[j] {
					return ErrGarbled
				}
				p.seen[j] = true
				if err := p.store(p.keySlot[j], tok[eq+1:], s); err != nil {
					return err
				}
				break
			}
		}
		// Keys the configuration does not name (a board temperature, a
		// status word) are skipped so firmware can grow new fields.
	}
	for _, seen := range p.seen {
		if !seen {
			return ErrGarbled
		}
	}
	return nil
}

// store parses one field into its slot.
func (p *Parser) store(slot int, tok []byte, s *Sample) error {
	switch slot {
	case slotSkip:
		return nil
	case slotTime:
		t, ok := parseUint(tok)
		if !ok || t > p.timeMask {
			return ErrGarbled
		}
		s.BoardTime, s.HasBoardTime = t, true
		return nil
	}
	v, kind := parseNumber(tok)
	switch kind {
	case numBad:
		return ErrGarbled
	case numNaN:
		s.NaNs++
		s.Values[slot] = math.NaN()
		return nil
	}
	c := &p.chans[slot]
	if math.IsInf(v, 0) || v < c.lo || v > c.hi {
		s.OutOfRange++
		s.Values[slot] = math.NaN()
		return nil
	}
	s.Values[slot] = v*c.scale + c.offset
	return nil
}
