package lineserial

// The line checksum is the XOR of every byte before '*', sent as two hex
// digits after it ("t=1 f=2*2C"). XOR is what an 8-bit board computes in
// one instruction per byte, and the '*HH' suffix is common practice for
// text protocols of serial instruments. It catches every single-bit error
// and most line-noise bursts; it does not catch two swapped bytes, which a
// UART does not produce.

// xorSum returns the XOR of b.
func xorSum(b []byte) byte {
	var s byte
	for _, c := range b {
		s ^= c
	}
	return s
}

// AppendChecksum appends "*HH" to line, for firmware simulators and tests.
func AppendChecksum(line []byte) []byte {
	const hex = "0123456789ABCDEF"
	s := xorSum(line)
	return append(line, '*', hex[s>>4], hex[s&0xF])
}

func hexNibble(c byte) (byte, bool) {
	switch {
	case c >= '0' && c <= '9':
		return c - '0', true
	case c >= 'A' && c <= 'F':
		return c - 'A' + 10, true
	case c >= 'a' && c <= 'f':
		return c - 'a' + 10, true
	}
	return 0, false
}

// splitChecksum checks and strips the "*HH" suffix of line.
func splitChecksum(line []byte) ([]byte, error) {
	n := len(line)
	if n < 3 || line[n-3] != '*' {
		return nil, ErrChecksum
	}
	hi, ok1 := hexNibble(line[n-2])
	lo, ok2 := hexNibble(line[n-1])
	if !ok1 || !ok2 {
		return nil, ErrChecksum
	}
	body := line[:n-3]
	if xorSum(body) != hi<<4|lo {
		return nil, ErrChecksum
	}
	return body, nil
}
