package daemon_test

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"path/filepath"
	"testing"
	"time"

	"gonum.org/v1/gonum/mat"

	"framed/daemon"
	"framed/daemon/calib"
	"framed/daemon/publish/brokertest"
	"framed/drivers/lineserial"
	"framed/drivers/lineserial/boardsim"
	"framed/drivers/modbusrtu"
	"framed/drivers/modbusrtu/rtusim"
	"framed/reduce/verify"
)

// The technician's flow on a simulated bridge board: tare, span with
// reference masses, verification, class. Everything the test expects is
// computed from the simulator's own parameters, never from the daemon's
// answers.
//
// The board (boardsim.LoadCell) reads
//
//	counts = O + G F (1 + k F / FS),  k = techNonlinPct / 100
//
// a 1 % non-linearity at full scale: far worse than a good load cell, so
// that the difference between a linear and a quadratic span shows in the
// class. With a quadratic span the only model error left is the cubic
// term of the inverse of the quadratic, 2 k^2 (F/FS)^3 FS ~ 0.02 % of full
// scale before the least-squares fit spreads it, so every point should
// come out in class 0.5. With a linear span through 0..100 kg followed by
// a tare at zero, the reading is about F (1 - k) (1 + k F/FS), i.e. off by
// roughly k (F/FS - 1): -0.8 % at 20 % of full scale, -0.6 % at 40 %,
// -0.4 % at 60 %: class 1 at the two lowest forces, 0.5 above. The test
// does not rely on that sketch: it predicts each point's error exactly
// with gonum's least squares on the noise-free counts, and takes the
// class from the predicted error and the ISO 7500-1 limits.
const (
	techOffsetCounts = 150000
	techCountsPerN   = 2000
	techNonlinPct    = 1.0
	techFullScaleN   = 1000
	techNoiseCounts  = 200
	techRateHz       = 1000
	// techSamples readings are averaged per read: the mean's noise is
	// 200/sqrt(200) = 14 counts = 0.007 N.
	techSamples = 200
)

var (
	techSpanKG   = []float64{0, 25, 50, 75, 100}
	techVerifyKG = []float64{20, 40, 60, 80, 100}
)

func techCell() boardsim.LoadCell {
	return boardsim.LoadCell{OffsetCounts: techOffsetCounts, CountsPerN: techCountsPerN,
		NonlinearityPct: techNonlinPct, FullScaleN: techFullScaleN, NoiseCounts: techNoiseCounts}
}

// techReading is the daemon's answer to op "read".
type techReading struct {
	RawMean        float64 `json:"raw_mean"`
	RawSD          float64 `json:"raw_sd"`
	CalibratedMean float64 `json:"calibrated_mean"`
	Samples        int     `json:"samples"`
}

// settledRead waits until n fresh readings plus a margin for the readings
// in transit (pty, driver batch, plugin) have arrived since the load was
// changed, then reads their mean. A read that still straddles the change
// (a slow machine holding more in transit) shows a spread of thousands of
// counts, above maxSD: it waits for as many readings again and rereads.
func settledRead(t *testing.T, socket string, n int, margin int, maxSD float64) techReading {
	t.Helper()
	var r techReading
	for attempt := 0; attempt < 5; attempt++ {
		c0 := status(t, socket)["readings"].(float64)
		waitFor(t, 20*time.Second, "fresh readings", func() bool {
			return status(t, socket)["readings"].(float64) >= c0+float64(n+margin)
		})
		ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		err := daemon.Call(ctx, socket, daemon.Request{Op: "read", Samples: n}, &r)
		cancel()
		if err != nil {
			t.Fatalf("read: %v", err)
		}
		if r.RawSD <= maxSD {
			return r
		}
	}
	t.Fatalf("readings not settled after 5 reads: raw sd %.4g > %.4g", r.RawSD, maxSD)
	return r
}

func techCall(t *testing.T, socket string, req daemon.Request, out any) {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := daemon.Call(ctx, socket, req, out); err != nil {
		t.Fatalf("%s: %v", req.Op, err)
	}
}

// runBoard plays b on a pty link until the test ends.
func runBoard(t *testing.T, run func(ctx context.Context, link *boardsim.Link) error) *boardsim.Link {
	t.Helper()
	link, err := boardsim.OpenLink(filepath.Join(t.TempDir(), "board"))
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- run(ctx, link) }()
	t.Cleanup(func() {
		cancel()
		if err := <-done; err != nil && ctx.Err() == nil {
			t.Errorf("simulated board: %v", err)
		}
		link.Close()
	})
	return link
}

// withPort is a driver's sample configuration pointed at port, with the
// given keys changed.
func withPort(t *testing.T, sample []byte, port string, set map[string]any) json.RawMessage {
	t.Helper()
	var m map[string]any
	if err := json.Unmarshal(sample, &m); err != nil {
		t.Fatal(err)
	}
	m["port"] = port
	for k, v := range set {
		m[k] = v
	}
	return mustJSON(t, m)
}

func techDaemon(t *testing.T, kind string, cfg json.RawMessage) (socket string) {
	t.Helper()
	addr := fmt.Sprintf("127.0.0.1:%d", brokertest.FreePort(t))
	_, socket = runDaemon(t, daemon.Config{
		Frame: "bench", StateDir: t.TempDir(), Broker: "embedded:" + addr,
		Drivers: []daemon.DriverConfig{{Name: kind, Kind: kind, Config: cfg}},
	}, daemon.Options{})
	return socket
}

// predictQPct predicts, from the board's noise-free counts, the relative
// error q (%) at each verification force after a span of the given degree
// fitted by least squares (gonum's QR solve, independent of calib's normal
// equations) and a tare at zero. Counts are scaled by 1e-6 so the
// quadratic column stays well conditioned; that changes the coefficients,
// not the fitted values.
func predictQPct(t *testing.T, cell boardsim.LoadCell, degree int, spanN, verifyN []float64) []float64 {
	t.Helper()
	row := func(forceN float64) []float64 {
		u := cell.Ideal(forceN) * 1e-6
		return []float64{1, u, u * u}[:degree+1]
	}
	A := mat.NewDense(len(spanN), degree+1, nil)
	for i, f := range spanN {
		A.SetRow(i, row(f))
	}
	var coef mat.VecDense
	if err := coef.SolveVec(A, mat.NewVecDense(len(spanN), append([]float64(nil), spanN...))); err != nil {
		t.Fatal(err)
	}
	model := func(forceN float64) float64 { return mat.Dot(mat.NewVecDense(degree+1, row(forceN)), &coef) }
	zero := model(0) // the tare after the span moves the zero here
	out := make([]float64, len(verifyN))
	for i, f := range verifyN {
		out[i] = 100 * (model(f) - zero - f) / f
	}
	return out
}

// isoClassForQ is the best ISO 7500-1 class whose accuracy limit q meets
// (limits 0.5, 1, 2, 3 %: ISO 7500-1 Table 2, from memory).
func isoClassForQ(qPct float64) verify.Class {
	for _, l := range []struct {
		c verify.Class
		q float64
	}{{verify.Class05, 0.5}, {verify.Class1, 1}, {verify.Class2, 2}, {verify.Class3, 3}} {
		if math.Abs(qPct) <= l.q {
			return l.c
		}
	}
	return verify.NoClass
}

func TestTechnicianLineBoardIntegration(t *testing.T) {
	g := boardsim.StandardGravity
	cell := techCell()
	var load boardsim.Load
	board, err := boardsim.NewBoard(cell, &load, 5)
	if err != nil {
		t.Fatal(err)
	}
	board.CrossheadCounts = 4000
	link := runBoard(t, func(ctx context.Context, l *boardsim.Link) error { return board.Run(ctx, l, techRateHz) })
	socket := techDaemon(t, "lineserial", withPort(t, lineserial.SampleConfig, link.Path(), map[string]any{"sample_rate_hz": techRateHz}))

	// A read straddling a load change would spread over thousands of
	// counts; a settled one shows the board's noise (200 counts sd).
	maxSD := 2.0 * techNoiseCounts
	margin := 150 // 0.15 s at 1 kHz for readings in transit
	hang := func(kg float64) { load.Set(kg * g) }

	// Tare, unloaded: the tare's own window then reads zero.
	waitFor(t, 20*time.Second, "first readings", func() bool { return status(t, socket)["readings"].(float64) > 500 })
	settledRead(t, socket, techSamples, margin, maxSD)
	var tare calib.Calibration
	techCall(t, socket, daemon.Request{Op: "tare", Channel: "force", Samples: techSamples}, &tare)
	if r := settledRead(t, socket, techSamples, margin, maxSD); math.Abs(r.CalibratedMean-r.RawMean+tare.Tare.MeanRaw) > 1e-6 {
		t.Errorf("after the tare: calibrated %v, raw %v, tare mean %v: want raw minus tare", r.CalibratedMean, r.RawMean, tare.Tare.MeanRaw)
	}

	// Span: the reference masses in turn.
	raw := make([]float64, len(techSpanKG))
	spanN := make([]float64, len(techSpanKG))
	for i, kg := range techSpanKG {
		hang(kg)
		raw[i] = settledRead(t, socket, techSamples, margin, maxSD).RawMean
		spanN[i] = kg * g
		// The raw mean is the board's count within the mean's noise
		// (14 counts sd; allow 6 sd).
		if want := cell.Ideal(spanN[i]); math.Abs(raw[i]-want) > 6*techNoiseCounts/math.Sqrt(techSamples) {
			t.Errorf("%v kg: raw mean %.1f counts, the board sends %.1f", kg, raw[i], want)
		}
	}
	refs, err := calib.ReferencesFromMasses(techSpanKG, raw, g)
	if err != nil {
		t.Fatal(err)
	}
	verifyN := make([]float64, len(techVerifyKG))
	for i, kg := range techVerifyKG {
		verifyN[i] = kg * g
	}

	for _, degree := range []int{2, 1} {
		t.Run(fmt.Sprintf("degree%d", degree), func(t *testing.T) {
			span, err := calib.NewSpan("force", "N", time.Now().UTC(), refs, degree)
			if err != nil {
				t.Fatal(err)
			}
			techCall(t, socket, daemon.Request{Op: "calibrate", Calibration: mustJSON(t, span)}, nil)
			// Zero before verifying (common practice): unloaded, tare again.
			hang(0)
			settledRead(t, socket, techSamples, margin, maxSD)
			techCall(t, socket, daemon.Request{Op: "tare", Channel: "force", Samples: techSamples}, nil)

			var readings []verify.Reading
			read := func(s verify.Series, refN float64) {
				r := settledRead(t, socket, techSamples, margin, maxSD)
				readings = append(readings, verify.Reading{Series: s, ReferenceN: refN, IndicatedN: r.CalibratedMean})
			}
			for _, s := range []verify.Series{verify.Series1, verify.Series2, verify.Series3} {
				hang(0) // each series starts from zero
				for i, kg := range techVerifyKG {
					hang(kg)
					read(s, verifyN[i])
				}
			}
			for i := len(techVerifyKG) - 1; i >= 0; i-- {
				hang(techVerifyKG[i])
				read(verify.Decreasing, verifyN[i])
			}
			hang(0)
			zeroAfterN := settledRead(t, socket, techSamples, margin, maxSD).CalibratedMean
			// Resolution: the reading is shown to 0.1 N, far below the
			// class 0.5 limit a = 0.25 % at 196 N (0.49 N).
			rep, err := verify.ClassifyForce(readings, 0.1, zeroAfterN)
			if err != nil {
				t.Fatal(err)
			}

			pred := predictQPct(t, cell, degree, spanN, verifyN)
			want := verify.Class05
			for i, p := range rep.Points {
				// A noise-free prediction within 0.05 % of a class limit
				// (several times the tolerance below) would make the
				// expected class a coin toss: the simulator parameters are
				// chosen to stay clear of that.
				for _, lim := range []float64{0.5, 1, 2, 3} {
					if math.Abs(math.Abs(pred[i])-lim) < 0.05 {
						t.Fatalf("predicted q %.3f %% at %.1f N is too close to the %g %% limit to test", pred[i], p.ReferenceN, lim)
					}
				}
				// Measured q differs from the prediction by the mean's noise
				// (0.007 N) plus the span's and tare's noise: a few
				// hundredths of a newton, under 0.03 % at 196 N.
				if p.QPct == nil || math.Abs(*p.QPct-pred[i]) > 0.03 {
					t.Errorf("%.1f N: q %v %%, predicted %.3f %%", p.ReferenceN, p.QPct, pred[i])
				}
				wc := isoClassForQ(pred[i])
				if p.Class != wc {
					t.Errorf("%.1f N: class %s, predicted %s (q %.3f %%; reasons %v)", p.ReferenceN, p.Class, wc, pred[i], p.Reasons)
				}
				want = want.Worse(wc)
				t.Logf("%.1f N: q %+.3f %% (predicted %+.3f %%) b %.3f %% class %s", p.ReferenceN, *p.QPct, pred[i], *p.BPct, p.Class)
			}
			if got := rep.Ranges[0].Class; got != want {
				t.Errorf("range from %.1f N: class %s, predicted %s (f0 %.4f %%)", rep.Ranges[0].FromN, got, want, rep.F0Pct)
			}
			// The predictions themselves: a quadratic span leaves class
			// 0.5, a linear one on this board only class 1 (see the
			// sketch at the top of the file).
			if wantFromSketch := map[int]verify.Class{2: verify.Class05, 1: verify.Class1}[degree]; want != wantFromSketch {
				t.Errorf("predicted class %s, the hand sketch says %s", want, wantFromSketch)
			}
		})
	}
}

// The Modbus indicator reports force in 0.1 N, with a zero offset and a
// gain error of its own (an indicator nobody adjusted): tare removes the
// offset, one span the gain error, and the readings then match the hung
// forces within the register resolution.
func TestTechnicianModbusIndicatorIntegration(t *testing.T) {
	const (
		zeroN      = 2.0  // the indicator reads 2.0 N unloaded
		gainErrPct = 0.4  // and 0.4 % high
		mmPerN     = 2e-4 // frame compliance, for the displacement register
		pollHz     = 50.0 // driver poll rate
		n          = 25   // readings averaged per read: 0.5 s
		margin     = 25   // readings in transit
		resN       = 0.1  // register resolution
		maxSD      = 0.2  // a settled register does not move
	)
	g := boardsim.StandardGravity
	slave, err := rtusim.NewSlave(1)
	if err != nil {
		t.Fatal(err)
	}
	var load boardsim.Load
	register := func(forceN float64) float64 { return math.Round((forceN*(1+gainErrPct/100) + zeroN) / resN) }
	link := runBoard(t, func(ctx context.Context, l *boardsim.Link) error {
		// The indicator updates its registers every 5 ms.
		go func() {
			tk := time.NewTicker(5 * time.Millisecond)
			defer tk.Stop()
			for {
				f := load.ForceN()
				// int32 in 0.1 N, high word first, holding 0-1;
				// float32 mm, low word first, input 10-11 (the layout of
				// modbusrtu's sample configuration).
				u := uint32(int32(register(f)))
				slave.SetHolding(0, uint16(u>>16), uint16(u))
				d := math.Float32bits(float32(f * mmPerN))
				slave.SetInput(10, uint16(d), uint16(d>>16))
				select {
				case <-ctx.Done():
					return
				case <-tk.C:
				}
			}
		}()
		err := slave.Serve(ctx, func() rtusim.Conn { return l })
		if ctx.Err() != nil {
			return nil
		}
		return err
	})
	socket := techDaemon(t, "modbusrtu", withPort(t, modbusrtu.SampleConfig, link.Path(), map[string]any{"poll_hz": pollHz}))
	hang := func(kg float64) { load.Set(kg * g) }

	waitFor(t, 20*time.Second, "first readings", func() bool { return status(t, socket)["readings"].(float64) > n })
	settledRead(t, socket, n, margin, maxSD)
	techCall(t, socket, daemon.Request{Op: "tare", Channel: "force", Samples: n}, nil)

	// Tared, not spanned: 50 kg reads the indicator's 0.4 % high value
	// less its zero.
	hang(50)
	r := settledRead(t, socket, n, margin, maxSD)
	if want := register(50*g)*resN - zeroN; math.Abs(r.CalibratedMean-want) > 1e-6 {
		t.Errorf("50 kg after the tare reads %.4f N, the indicator shows %.4f N less its zero", r.CalibratedMean, want)
	}

	// One span, 0 and 100 kg.
	masses := []float64{0, 100}
	raw := make([]float64, len(masses))
	for i, kg := range masses {
		hang(kg)
		raw[i] = settledRead(t, socket, n, margin, maxSD).RawMean
	}
	refs, err := calib.ReferencesFromMasses(masses, raw, g)
	if err != nil {
		t.Fatal(err)
	}
	span, err := calib.NewSpan("force", "N", time.Now().UTC(), refs, 1)
	if err != nil {
		t.Fatal(err)
	}
	techCall(t, socket, daemon.Request{Op: "calibrate", Calibration: mustJSON(t, span)}, nil)
	for _, kg := range []float64{25, 50, 75} {
		hang(kg)
		got := settledRead(t, socket, n, margin, maxSD).CalibratedMean
		// Rounding to the register's 0.1 N puts each reading within half
		// a step of the truth, and the span's two points each within half
		// a step too: one step bounds the error.
		if math.Abs(got-kg*g) > resN {
			t.Errorf("%v kg = %.4f N reads %.4f N after the span: off by more than the register's %g N", kg, kg*g, got, resN)
		}
	}
}
