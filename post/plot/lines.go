package plot

import (
	"errors"
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// LineSpec describes a line chart: curves such as F_z(z), P(z), R(f) and L(f), or temperature against time.
type LineSpec struct {
	Title string
	// XLabel and YLabel name the axes with their units, e.g. "z (mm)", "F_z (N)".
	XLabel, YLabel string
	// LogX and LogY select base-10 logarithmic axes; every value on such an axis must then be positive.
	LogX, LogY bool
	Series     []Series
	// HLines are horizontal reference lines drawn across the chart (e.g. the part's weight).
	HLines []HLine
	// Marks are single marked points (e.g. equilibria).
	Marks []Mark
}

// Series is one curve.
type Series struct {
	Name string // legend text; empty keeps the series out of the legend
	X, Y []float64
	// Points also draws a marker at every sample.
	Points bool
}

// HLine is a horizontal line at Y, dashed, with an optional legend text.
type HLine struct {
	Y     float64
	Label string
}

// MarkKind tells how a marked point is drawn.
type MarkKind int

const (
	// MarkPlain is a small filled square.
	MarkPlain MarkKind = iota
	// MarkStable is a filled disc: a stable equilibrium (restoring force).
	MarkStable
	// MarkUnstable is an open ring: an unstable equilibrium.
	MarkUnstable
)

func (k MarkKind) glyph(c color.Color) draw.GlyphStyle {
	g := draw.GlyphStyle{Color: c, Radius: vg.Points(3.5)}
	switch k {
	case MarkStable:
		g.Shape = draw.CircleGlyph{}
	case MarkUnstable:
		g.Shape = draw.RingGlyph{}
		g.Radius = vg.Points(4)
	default:
		g.Shape = draw.SquareGlyph{}
		g.Radius = vg.Points(3)
	}
	return g
}

// Mark is a marked point; points of the same kind and label share one legend entry.
type Mark struct {
	X, Y  float64
	Kind  MarkKind
	Label string
}

// Lines builds a line chart from spec. Every series needs matching, non-empty X and Y of finite numbers.
func Lines(spec LineSpec) (*plot.Plot, error) {
	if len(spec.Series) == 0 && len(spec.Marks) == 0 {
		return nil, errors.New("plot: line chart: nothing to draw")
	}
	p := plot.New()
	p.Title.Text = spec.Title
	p.X.Label.Text, p.Y.Label.Text = spec.XLabel, spec.YLabel
	p.Legend.Top = true
	if spec.LogX {
		p.X.Scale, p.X.Tick.Marker = plot.LogScale{}, plot.LogTicks{Prec: -1}
	}
	if spec.LogY {
		p.Y.Scale, p.Y.Tick.Marker = plot.LogScale{}, plot.LogTicks{Prec: -1}
	}
	check := func(what string, x, y float64) error {
		if math.IsNaN(x) || math.IsInf(x, 0) || math.IsNaN(y) || math.IsInf(y, 0) {
			return fmt.Errorf("plot: line chart: %s: non-finite point (%g, %g)", what, x, y)
		}
		if spec.LogX && x <= 0 || spec.LogY && y <= 0 {
			return fmt.Errorf("plot: line chart: %s: point (%g, %g) not positive on a log axis", what, x, y)
		}
		return nil
	}
	p.Add(plotter.NewGrid())
	for i, s := range spec.Series {
		if len(s.X) != len(s.Y) || len(s.X) == 0 {
			return nil, fmt.Errorf("plot: line chart: series %q has %d x and %d y values", s.Name, len(s.X), len(s.Y))
		}
		xys := make(plotter.XYs, len(s.X))
		for j := range s.X {
			if err := check(fmt.Sprintf("series %q", s.Name), s.X[j], s.Y[j]); err != nil {
				return nil, err
			}
			xys[j] = plotter.XY{X: s.X[j], Y: s.Y[j]}
		}
		col := SeriesColor(i)
		l, err := plotter.NewLine(xys)
		if err != nil {
			return nil, fmt.Errorf("plot: line chart: series %q: %w", s.Name, err)
		}
		l.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1.4)}
		p.Add(l)
		thumbs := []plot.Thumbnailer{l}
		if s.Points {
			sc, err := plotter.NewScatter(xys)
			if err != nil {
				return nil, fmt.Errorf("plot: line chart: series %q: %w", s.Name, err)
			}
			sc.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2), Shape: draw.CircleGlyph{}}
			p.Add(sc)
			thumbs = append(thumbs, sc)
		}
		if s.Name != "" {
			p.Legend.Add(s.Name, thumbs...)
		}
	}
	for _, h := range spec.HLines {
		if err := check("horizontal line", 1, h.Y); err != nil {
			return nil, err
		}
		hl := &hLine{y: h.Y, style: draw.LineStyle{Color: color.Gray{Y: 60}, Width: vg.Points(1),
			Dashes: []vg.Length{vg.Points(5), vg.Points(3)}}}
		p.Add(hl)
		if h.Label != "" {
			p.Legend.Add(h.Label, hl)
		}
	}
	type markKey struct {
		kind  MarkKind
		label string
	}
	groups := map[markKey]plotter.XYs{}
	var order []markKey
	for _, mk := range spec.Marks {
		if err := check("mark", mk.X, mk.Y); err != nil {
			return nil, err
		}
		k := markKey{mk.Kind, mk.Label}
		if _, ok := groups[k]; !ok {
			order = append(order, k)
		}
		groups[k] = append(groups[k], plotter.XY{X: mk.X, Y: mk.Y})
	}
	for _, k := range order {
		sc, err := plotter.NewScatter(groups[k])
		if err != nil {
			return nil, fmt.Errorf("plot: line chart: marks: %w", err)
		}
		sc.GlyphStyle = k.kind.glyph(color.NRGBA{R: 15, G: 15, B: 20, A: 255})
		p.Add(sc)
		if k.label != "" {
			p.Legend.Add(k.label, sc)
		}
	}
	// A little room above and below the data on a linear y axis, so that no point sits on the frame, and the
	// legend in the top corner the first series leaves free (the left one when it rises to the right).
	if !spec.LogY && p.Y.Max > p.Y.Min {
		pad := 0.05 * (p.Y.Max - p.Y.Min)
		p.Y.Min, p.Y.Max = p.Y.Min-pad, p.Y.Max+pad
	}
	if len(spec.Series) > 0 {
		if y := spec.Series[0].Y; len(y) > 1 && y[len(y)-1] > y[0] {
			p.Legend.Left = true
		}
	}
	return p, nil
}

// hLine is a horizontal line across the whole width of the data area.
type hLine struct {
	y     float64
	style draw.LineStyle
}

// Plot implements plot.Plotter.
func (h *hLine) Plot(c draw.Canvas, p *plot.Plot) {
	_, trY := p.Transforms(&c)
	y := trY(h.y)
	c.StrokeLine2(h.style, c.Min.X, y, c.Max.X, y)
}

// DataRange implements plot.DataRanger: only the line's height, so it widens the y range to show it.
func (h *hLine) DataRange() (xmin, xmax, ymin, ymax float64) {
	return math.Inf(1), math.Inf(-1), h.y, h.y
}

// Thumbnail implements plot.Thumbnailer.
func (h *hLine) Thumbnail(c *draw.Canvas) {
	y := c.Center().Y
	c.StrokeLine2(h.style, c.Min.X, y, c.Max.X, y)
}
