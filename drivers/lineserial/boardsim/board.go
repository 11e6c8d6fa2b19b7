package boardsim

import (
	"context"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"time"

	"framed/drivers/lineserial"
)

// Board is a simulated bridge board printing one key=value line per
// sample, with the XOR checksum:
//
//	t=<board micros> f=<force counts> x=<crosshead counts>*HH
//
// the layout of drivers/lineserial's sample configuration. The board
// clock is a 32-bit microsecond counter that wraps, like micros() on a
// microcontroller.
type Board struct {
	Cell  LoadCell
	Force ForceSource
	// CrossheadCounts is the constant crosshead encoder reading.
	CrossheadCounts int64
	// StartUS is the board clock at the first line.
	StartUS uint32

	rng *rand.Rand
}

// NewBoard returns a board reading force from src, its noise drawn from a
// generator seeded with seed (the same seed gives the same lines).
func NewBoard(cell LoadCell, src ForceSource, seed uint64) (*Board, error) {
	if err := cell.Validate(); err != nil {
		return nil, err
	}
	return &Board{Cell: cell, Force: src, rng: rand.New(rand.NewPCG(seed, 0x6672616d6564))}, nil
}

// AppendLine appends sample i's line (with "\r\n") at rateHz: board time
// StartUS + i/rateHz seconds in microseconds, modulo 2^32.
func (b *Board) AppendLine(dst []byte, i int64, rateHz float64) []byte {
	tUS := b.StartUS + uint32(uint64(math.Round(float64(i)*1e6/rateHz)))
	start := len(dst)
	dst = append(dst, "t="...)
	dst = strconv.AppendUint(dst, uint64(tUS), 10)
	dst = append(dst, " f="...)
	dst = strconv.AppendInt(dst, b.Cell.Counts(b.Force.ForceN(), b.rng), 10)
	dst = append(dst, " x="...)
	dst = strconv.AppendInt(dst, b.CrossheadCounts, 10)
	dst = append(dst[:start], lineserial.AppendChecksum(dst[start:])...)
	return append(dst, '\r', '\n')
}

// Banner is the comment line the board prints at power-up; the driver
// skips it.
const Banner = "# framed simulated bridge board\r\n"

// tick is how often Run writes the lines that have fallen due: a USB
// serial bridge also delivers lines in bursts of a few milliseconds.
const tick = 5 * time.Millisecond

// Run writes the banner, then lines at rateHz, paced by the wall clock,
// until ctx is done (returns nil) or a write fails (returns the error).
// The board clock advances by exactly 1/rateHz per line whatever the
// pacing jitter, as a board sampling on its own timer does.
func (b *Board) Run(ctx context.Context, w io.Writer, rateHz float64) error {
	if math.IsNaN(rateHz) || math.IsInf(rateHz, 0) || rateHz <= 0 || rateHz > 100000 {
		return fmt.Errorf("%w: %v Hz (want 0 < rate <= 100000)", ErrBadRate, rateHz)
	}
	if _, err := io.WriteString(w, Banner); err != nil {
		return fmt.Errorf("board banner: %w", err)
	}
	start := time.Now()
	t := time.NewTicker(tick)
	defer t.Stop()
	var i int64
	var buf []byte
	for {
		select {
		case <-ctx.Done():
			return nil
		case now := <-t.C:
			due := int64(now.Sub(start).Seconds() * rateHz)
			buf = buf[:0]
			for ; i < due; i++ {
				buf = b.AppendLine(buf, i, rateHz)
			}
			if len(buf) == 0 {
				continue
			}
			if _, err := w.Write(buf); err != nil {
				return fmt.Errorf("board line %d: %w", i, err)
			}
		}
	}
}
