package main

import (
	"context"
	"flag"
	"fmt"
	"image/color"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"framed/reduce"
)

func init() {
	register(&command{
		name:    "plot",
		summary: "draw the stress-strain curve of a curve file with the result's points (-o FILE.png|.svg)",
		run:     runPlot,
	})
}

func runPlot(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("plot", flag.ContinueOnError)
	fs.SetOutput(stderr)
	geo := addGeometryFlags(fs)
	out := fs.String("o", "", "output file, .png or .svg")
	state := stateFlag(fs)
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: framectl plot FILE.csv|TEST-ID -o OUT.png|OUT.svg [geometry flags as for reduce]")
		fs.PrintDefaults()
	}
	pos, err := parseInterleaved(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return fmt.Errorf("%w: want one SOURCE (curve file or stored test id), got %d arguments", errUsage, len(pos))
	}
	if err := checkPlotPath(*out); err != nil {
		return err
	}
	src := pos[0]
	if st, err := os.Stat(src); err != nil || st.IsDir() {
		// Not a file: a stored test id, plotted with its own result.
		dir, derr := stateDir(*state)
		if derr != nil {
			return fmt.Errorf("%q is not a curve file; for a stored test %w", src, derr)
		}
		c, res, err := loadStoredTest(ctx, dir, src)
		if err != nil {
			return err
		}
		if err := plotResult(c, res, *out); err != nil {
			return err
		}
		fmt.Fprintf(stdout, "wrote %s\n", *out)
		return nil
	}
	sp, err := geo.specimen()
	if err != nil {
		return err
	}
	opt, err := geo.options()
	if err != nil {
		return err
	}
	c, err := readCurveFile(src)
	if err != nil {
		return err
	}
	res, err := reduce.Reduce(c, sp, detectOffline(c), opt)
	if err != nil {
		return fmt.Errorf("%s: %w", src, err)
	}
	if err := plotResultWith(c, res, opt, *out); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "wrote %s\n", *out)
	return nil
}

func checkPlotPath(path string) error {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".png", ".svg":
		return nil
	case "":
		return fmt.Errorf("%w: give the output file with -o FILE.png or -o FILE.svg", errUsage)
	default:
		return fmt.Errorf("%w: -o %q: only .png and .svg are drawn", errUsage, path)
	}
}

// plotResult draws the stress-strain curve of c with the points of res
// marked, to path (.png or .svg). The curve is recomputed with the result's
// specimen and default options, on the same strain axis the values were
// read from.
func plotResult(c reduce.Curve, res reduce.Result, path string) error {
	return plotResultWith(c, res, reduce.Options{}, path)
}

// maxPlotPoints thins long records: a page shows no more.
const maxPlotPoints = 4000

func plotResultWith(c reduce.Curve, res reduce.Result, opt reduce.Options, path string) error {
	if err := checkPlotPath(path); err != nil {
		return err
	}
	ss, err := reduce.ComputeStressStrain(c, res.Specimen.Specimen, reduce.Detected{Events: res.Events}, opt)
	if err != nil {
		return err
	}
	p := plot.New()
	title := "stress-strain"
	if res.Specimen.ID != "" {
		title += " - " + res.Specimen.ID
	}
	p.Title.Text = title
	p.X.Label.Text = "strain (% of Le)"
	p.Y.Label.Text = "engineering stress (MPa)"
	p.Add(plotter.NewGrid())

	last := ss.BreakIndex
	stride := max(1, (last+1)/maxPlotPoints)
	var xy plotter.XYs
	for i := 0; i <= last; i += stride {
		x, y := ss.StrainPct[i], ss.StressMPa[i]
		if isFinite(x) && isFinite(y) {
			xy = append(xy, plotter.XY{X: x, Y: y})
		}
	}
	if len(xy) < 2 {
		return fmt.Errorf("plot: too few points with both stress and strain to draw")
	}
	line, err := plotter.NewLine(xy)
	if err != nil {
		return err
	}
	line.Color = color.RGBA{B: 160, A: 255}
	p.Add(line)
	p.Legend.Add("curve", line)

	q := map[string]float64{}
	for _, v := range res.Quantities {
		q[v.Symbol] = v.Value
	}
	// The elastic line, and the offset line of Rp0.2.
	if ss.EMPa > 0 {
		top := q["Rm"]
		if rp, ok := q["Rp0.2"]; ok {
			top = rp * 1.1
		}
		el, _ := plotter.NewLine(plotter.XYs{{X: 0, Y: 0}, {X: 100 * top / ss.EMPa, Y: top}})
		el.Color = color.RGBA{R: 200, A: 255}
		el.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		p.Add(el)
		p.Legend.Add(fmt.Sprintf("E %.1f GPa", ss.EMPa/1000), el)
		if rp, ok := q["Rp0.2"]; ok {
			off, _ := plotter.NewLine(plotter.XYs{{X: 0.2, Y: 0}, {X: 0.2 + 100*rp*1.05/ss.EMPa, Y: rp * 1.05}})
			off.Color = color.RGBA{R: 200, G: 120, A: 255}
			off.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
			p.Add(off)
		}
	}
	var marks plotter.XYs
	var labels []string
	mark := func(name string, x, y float64) {
		if isFinite(x) && isFinite(y) {
			marks = append(marks, plotter.XY{X: x, Y: y})
			labels = append(labels, name)
		}
	}
	if rp, ok := q["Rp0.2"]; ok && ss.EMPa > 0 {
		mark("Rp0.2", 0.2+100*rp/ss.EMPa, rp)
	}
	if agt, ok := q["Agt"]; ok {
		mark("Rm", agt, q["Rm"])
	}
	if reh, ok := q["ReH"]; ok {
		mark("ReH", strainAtStress(ss, reh, 0), reh)
		if rel, ok := q["ReL"]; ok {
			mark("ReL", strainAtStress(ss, rel, firstAtOrAbove(ss, reh)), rel)
		}
	}
	if at, ok := q["At"]; ok {
		mark("break", at, ss.StressMPa[ss.BreakIndex])
	}
	if len(marks) > 0 {
		sc, err := plotter.NewScatter(marks)
		if err != nil {
			return err
		}
		sc.GlyphStyle.Shape = draw.CircleGlyph{}
		sc.GlyphStyle.Radius = vg.Points(3)
		sc.GlyphStyle.Color = color.RGBA{R: 180, A: 255}
		p.Add(sc)
		lb, err := plotter.NewLabels(plotter.XYLabels{XYs: marks, Labels: labels})
		if err != nil {
			return err
		}
		for i := range lb.TextStyle {
			lb.TextStyle[i].XAlign = draw.XLeft
		}
		lb.Offset = vg.Point{X: vg.Points(5), Y: vg.Points(3)}
		p.Add(lb)
	}
	p.Legend.Top = false
	p.Legend.Left = false
	p.Legend.XOffs = -vg.Points(10)
	p.Legend.YOffs = vg.Points(10)
	p.Y.Min = 0
	if err := p.Save(8*vg.Inch, 5*vg.Inch, path); err != nil {
		return fmt.Errorf("plot: %w", err)
	}
	return nil
}

func isFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// firstAtOrAbove is the first sample whose stress reaches s.
func firstAtOrAbove(ss reduce.StressStrain, s float64) int {
	for i, v := range ss.StressMPa {
		if v >= s-1e-9 {
			return i
		}
	}
	return 0
}

// strainAtStress is the strain of the sample from index from on whose
// stress is closest to s, before the maximum force.
func strainAtStress(ss reduce.StressStrain, s float64, from int) float64 {
	best, bi := math.Inf(1), -1
	for i := from; i <= ss.FmIndex && i < len(ss.StressMPa); i++ {
		if d := math.Abs(ss.StressMPa[i] - s); d < best && isFinite(ss.StrainPct[i]) {
			best, bi = d, i
			if d == 0 {
				break
			}
		}
	}
	if bi < 0 {
		return math.NaN()
	}
	return ss.StrainPct[bi]
}
