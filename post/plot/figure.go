package plot

import (
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Drawer is anything that draws itself onto a canvas: *plot.Plot and *Figure.
type Drawer interface {
	Draw(c draw.Canvas)
}

// Window is a rectangle of the r-z half plane in metres, used to zoom a picture onto part of the mesh.
type Window struct{ RMin, RMax, ZMin, ZMax float64 }

func (w Window) valid() bool {
	return w.RMax > w.RMin && w.ZMax > w.ZMin && !math.IsInf(w.RMax-w.RMin, 0) && !math.IsInf(w.ZMax-w.ZMin, 0)
}

// Figure is an r-z picture: a plot whose axes are in millimetres, drawn at equal scale in r and z (one
// millimetre of r is as long as one of z on the page), with an optional panel on its right holding a colour
// bar or a legend. Plot is exposed so callers can restyle it; its axis ranges are recomputed at every Draw from
// the window the figure was made for, to keep the scales equal for any page size.
type Figure struct {
	Plot *plot.Plot
	// EqualAspect keeps r and z at the same scale (default true); the shorter direction is widened to fit.
	EqualAspect bool

	view   [4]float64 // xmin, xmax, ymin, ymax of the wanted window in mm
	bar    *colorBar
	legend *plot.Legend // nil, or a legend with entries for the side panel
	fill   *triFill     // the filled triangles, kept for tests
}

func newFigure(title string, viewMM [4]float64) *Figure {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = "r (mm)"
	p.Y.Label.Text = "z (mm)"
	p.X.Padding, p.Y.Padding = 0, 0
	return &Figure{Plot: p, EqualAspect: true, view: viewMM}
}

const (
	panelGap   = vg.Length(10)
	stripWidth = vg.Length(12)
	tickLength = vg.Length(4)
)

// Draw draws the figure onto c: it is what Save calls.
func (f *Figure) Draw(c draw.Canvas) {
	p := f.Plot
	mainC := f.mainCanvas(c)
	f.fitRanges(mainC)
	p.Draw(mainC)
	dc := p.DataCanvas(mainC)
	panel := draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{
		Min: vg.Point{X: mainC.Max.X + panelGap, Y: dc.Min.Y},
		Max: vg.Point{X: c.Max.X, Y: dc.Max.Y},
	}}
	switch {
	case f.bar != nil:
		f.bar.draw(panel, p)
	case f.legend != nil:
		f.legend.Draw(panel)
	}
}

// mainCanvas returns the part of c left for the plot once the side panel has its room.
func (f *Figure) mainCanvas(c draw.Canvas) draw.Canvas {
	side := vg.Length(0)
	switch {
	case f.bar != nil:
		side = f.bar.width(f.Plot)
	case f.legend != nil:
		side = panelGap + f.legend.Rectangle(c).Size().X + 6
	}
	side = min(side, (c.Max.X-c.Min.X)/2)
	return draw.Crop(c, 0, -side, 0, 0)
}

// fitRanges sets the axis ranges to the wanted window, widened in one direction for equal scales.
func (f *Figure) fitRanges(c draw.Canvas) {
	p := f.Plot
	x0, x1, y0, y1 := f.view[0], f.view[1], f.view[2], f.view[3]
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, y0, y1
	if !f.EqualAspect {
		return
	}
	// Tick labels change with the ranges and the data area with the labels: two passes settle it.
	for range 2 {
		dc := p.DataCanvas(c)
		w, h := float64(dc.Max.X-dc.Min.X), float64(dc.Max.Y-dc.Min.Y)
		if w <= 0 || h <= 0 {
			return
		}
		s := math.Max((x1-x0)/w, (y1-y0)/h)                          // mm per point
		dx, dy := math.Max(0, s*w-(x1-x0)), math.Max(0, s*h-(y1-y0)) // one of them is 0 up to rounding
		if x0 >= 0 && x0-dx/2 < 0 {
			// Do not widen past the axis of symmetry: grow outwards only.
			p.X.Min, p.X.Max = x0, x1+dx
		} else {
			p.X.Min, p.X.Max = x0-dx/2, x1+dx/2
		}
		p.Y.Min, p.Y.Max = y0-dy/2, y1+dy/2
	}
}

// colorBar is the key of a field map: the colour strip, ticks with values, and the unit on top.
type colorBar struct {
	cm    *ColorMap
	scale colorScale
	unit  string
}

func (b *colorBar) ticks() []plot.Tick {
	lo, hi := b.scale.lo, b.scale.hi
	if !b.scale.log {
		var out []plot.Tick
		for _, t := range (plot.DefaultTicks{}).Ticks(lo, hi) {
			if t.Label != "" && t.Value >= lo && t.Value <= hi {
				out = append(out, t)
			}
		}
		return out
	}
	var out []plot.Tick
	step := math.Max(1, math.Ceil((math.Floor(hi)-math.Ceil(lo))/8))
	for k := math.Ceil(lo); k <= hi; k += step {
		out = append(out, plot.Tick{Value: k, Label: strconv.FormatFloat(math.Pow(10, k), 'g', 3, 64)})
	}
	return out
}

func (b *colorBar) width(p *plot.Plot) vg.Length {
	sty := p.Y.Tick.Label
	w := vg.Length(0)
	for _, t := range b.ticks() {
		w = max(w, sty.Width(t.Label))
	}
	w = stripWidth + tickLength + 2 + w + 4
	return panelGap + max(w, p.Y.Label.TextStyle.Width(b.unit)+4)
}

func (b *colorBar) draw(c draw.Canvas, p *plot.Plot) {
	x0, x1 := c.Min.X, c.Min.X+stripWidth
	y0, y1 := c.Min.Y, c.Max.Y
	if y1 <= y0 {
		return
	}
	// The strip is drawn in lutSize slabs, one per colour of the map.
	h := (y1 - y0) / lutSize
	for i := range lutSize {
		ya := y0 + vg.Length(i)*h
		var path vg.Path
		path.Move(vg.Point{X: x0, Y: ya})
		path.Line(vg.Point{X: x1, Y: ya})
		path.Line(vg.Point{X: x1, Y: ya + h + 0.2}) // slight overlap hides anti-aliasing seams
		path.Line(vg.Point{X: x0, Y: ya + h + 0.2})
		path.Close()
		c.SetColor(b.cm.color(i))
		c.Fill(path)
	}
	frame := draw.LineStyle{Color: color.Black, Width: vg.Points(0.5)}
	c.StrokeLines(frame, []vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}, {X: x0, Y: y0}})
	sty := p.Y.Tick.Label
	sty.XAlign, sty.YAlign = draw.XLeft, draw.YCenter
	lo, hi := b.scale.lo, b.scale.hi
	for _, t := range b.ticks() {
		y := y0 + vg.Length((t.Value-lo)/(hi-lo))*(y1-y0)
		c.StrokeLine2(frame, x1, y, x1+tickLength, y)
		c.FillText(sty, vg.Point{X: x1 + tickLength + 2, Y: y}, t.Label)
	}
	if b.unit != "" {
		us := p.Y.Label.TextStyle
		us.Rotation = 0
		us.XAlign, us.YAlign = draw.XLeft, draw.YBottom
		c.FillText(us, vg.Point{X: x0, Y: y1 + 4}, b.unit)
	}
}
