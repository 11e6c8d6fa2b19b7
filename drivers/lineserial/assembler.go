package lineserial

import "bytes"

// assembler cuts a byte stream into lines of at most max bytes. A line
// that outgrows max is dropped up to its newline, so a board spewing
// garbage without newlines costs bounded memory and one count.
type assembler struct {
	buf      []byte
	max      int
	skipping bool
}

func newAssembler(maxBytes int) assembler {
	return assembler{buf: make([]byte, 0, maxBytes), max: maxBytes}
}

// feed splits chunk, calling line for each complete line (valid until
// line returns) and overlong for each dropped one.
func (a *assembler) feed(chunk []byte, line func([]byte), overlong func()) {
	for len(chunk) > 0 {
		i := bytes.IndexByte(chunk, '\n')
		if i < 0 {
			if !a.skipping {
				if len(a.buf)+len(chunk) > a.max {
					a.skipping = true
					a.buf = a.buf[:0]
					overlong()
				} else {
					a.buf = append(a.buf, chunk...)
				}
			}
			return
		}
		part := chunk[:i]
		chunk = chunk[i+1:]
		switch {
		case a.skipping:
			a.skipping = false
		case len(a.buf)+len(part) > a.max:
			a.buf = a.buf[:0]
			overlong()
		case len(a.buf) == 0:
			line(part)
		default:
			a.buf = append(a.buf, part...)
			line(a.buf)
			a.buf = a.buf[:0]
		}
	}
}

// reset drops a partial line (the port closed mid-line) and reports
// whether there was one.
func (a *assembler) reset() (hadPartial bool) {
	hadPartial = len(a.buf) > 0
	a.buf = a.buf[:0]
	a.skipping = false
	return hadPartial
}
