package main

import (
	"bytes"
	"fmt"
	"html/template"
	"image/color"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Chart size in the HTML report.
const (
	chartWidth  = 16 * vg.Centimeter
	chartHeight = 8 * vg.Centimeter
)

var (
	inkMain = color.RGBA{R: 0x1f, G: 0x4e, B: 0x79, A: 0xff}
	inkBest = color.RGBA{R: 0xb0, G: 0x5a, B: 0x00, A: 0xff}
	inkMark = color.RGBA{R: 0x80, G: 0x80, B: 0x80, A: 0xff}
)

// svgOf renders a plot as an inline SVG element (no XML prologue, no
// external resources: the fonts are named, not loaded).
func svgOf(p *plot.Plot) (template.HTML, error) {
	c := vgsvg.New(chartWidth, chartHeight)
	p.Draw(draw.New(c))
	var b bytes.Buffer
	if _, err := c.WriteTo(&b); err != nil {
		return "", fmt.Errorf("draw chart: %w", err)
	}
	s := b.String()
	if i := strings.Index(s, "<svg"); i > 0 {
		s = s[i:]
	}
	return template.HTML(s), nil // built by vgsvg from our own numbers and labels
}

func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font.Size = vg.Points(13)
	p.X.Label.Text = x
	p.Y.Label.Text = y
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font.Size = vg.Points(11)
		ax.Tick.Label.Font.Size = vg.Points(10)
	}
	p.Legend.TextStyle.Font.Size = vg.Points(10)
	p.Add(plotter.NewGrid())
	return p
}

// spectrumChart draws the singular values with rank k marked.
func spectrumChart(values []num, k int) (template.HTML, error) {
	p := newPlot("Singular values", "i", "σ_i")
	pts := make(plotter.XYs, len(values))
	var top float64
	for i, v := range values {
		pts[i] = plotter.XY{X: float64(i + 1), Y: float64(v)}
		top = max(top, float64(v))
	}
	line, dots, err := plotter.NewLinePoints(pts)
	if err != nil {
		return "", err
	}
	line.Color, dots.Color = inkMain, inkMain
	mark, err := plotter.NewLine(plotter.XYs{{X: float64(k), Y: 0}, {X: float64(k), Y: top}})
	if err != nil {
		return "", err
	}
	mark.Color, mark.Dashes = inkMark, []vg.Length{vg.Points(4), vg.Points(3)}
	p.Add(line, dots, mark)
	p.Legend.Add("σ_i", line, dots)
	p.Legend.Add(fmt.Sprintf("k = %d", k), mark)
	p.Legend.Top = true
	return svgOf(p)
}

// curveChart draws the share spanned by the first t picks beside the
// best any t-dimensional summary could span.
func curveChart(curve []curveOut) (template.HTML, error) {
	p := newPlot("How many to read", "documents", "share of the corpus")
	got := make(plotter.XYs, len(curve))
	best := make(plotter.XYs, len(curve))
	for i, c := range curve {
		got[i] = plotter.XY{X: float64(c.Docs), Y: float64(c.Captured)}
		best[i] = plotter.XY{X: float64(c.Docs), Y: float64(c.BestCaptured)}
	}
	l1, err := plotter.NewLine(got)
	if err != nil {
		return "", err
	}
	l2, err := plotter.NewLine(best)
	if err != nil {
		return "", err
	}
	l1.Color, l1.Width = inkMain, vg.Points(1.5)
	l2.Color, l2.Dashes = inkBest, []vg.Length{vg.Points(4), vg.Points(3)}
	p.Add(l1, l2)
	p.Legend.Add("the picked documents", l1)
	p.Legend.Add("best possible (rank-t SVD)", l2)
	p.Legend.Top, p.Legend.Left = true, true
	p.Y.Min = 0
	return svgOf(p)
}

// histogramChart draws how many documents fall in each coverage decile.
func histogramChart(hist []int) (template.HTML, error) {
	p := newPlot("Coverage of the documents by the exemplars", "coverage", "documents")
	vals := make(plotter.Values, len(hist))
	names := make([]string, len(hist))
	for i, h := range hist {
		vals[i] = float64(h)
		names[i] = fmt.Sprintf("%d–%d%%", 10*i, 10*(i+1))
	}
	bars, err := plotter.NewBarChart(vals, vg.Points(18))
	if err != nil {
		return "", err
	}
	bars.Color, bars.LineStyle.Width = inkMain, 0
	p.Add(bars)
	p.NominalX(names...)
	return svgOf(p)
}

// groupChart draws the size of each exemplar's group.
func groupChart(ex []exemplarOut) (template.HTML, error) {
	p := newPlot("Documents each exemplar stands for", "exemplar", "documents")
	vals := make(plotter.Values, len(ex))
	names := make([]string, len(ex))
	for i, e := range ex {
		vals[i] = float64(e.Group.Size)
		names[i] = fmt.Sprint(i + 1)
	}
	bars, err := plotter.NewBarChart(vals, vg.Points(12))
	if err != nil {
		return "", err
	}
	bars.Color, bars.LineStyle.Width = inkBest, 0
	p.Add(bars)
	p.NominalX(names...)
	return svgOf(p)
}
