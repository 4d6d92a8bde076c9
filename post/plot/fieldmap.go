package plot

import (
	"errors"
	"fmt"
	"image"
	"image/color"
	stddraw "image/draw"
	"math"

	"eddyrz/mesh"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// FieldSpec describes a field map: a value coloured over the mesh, optional flux lines and outlines.
type FieldSpec struct {
	// Title is drawn above the picture, e.g. the job name and frequency.
	Title string
	// Unit labels the colour bar, e.g. "W/m³" or "T rms".
	Unit string

	// Exactly one of CellValues (one per triangle) and NodeValues (one per node, midpoint nodes included on a
	// quadratic mesh) gives the coloured quantity. Node values colour each drawn (sub)triangle with the mean
	// of its three nodes. NaN marks a triangle that is not drawn (for example air, when only the metal is of
	// interest).
	CellValues []float64
	NodeValues []float64

	// Log selects a logarithmic colour scale. Its top is the largest value and its bottom lies Decades
	// decades lower (default 4); smaller values, zero and negatives take the bottom colour.
	Log     bool
	Decades float64
	// Min and Max fix the colour range when Max > Min (on a log scale both must be positive); otherwise the
	// range comes from the data.
	Min, Max float64

	// Flux is a nodal scalar drawn as contour lines (for eddyrz the flux function 2πr·Re{A} in Wb, whose
	// level curves are field lines). Nil for none.
	Flux []float64
	// FluxLines is the number of evenly spaced levels between the smallest and largest Flux (default 20).
	FluxLines int

	// Outlines are polylines in metres drawn on top (conductor outlines); close a loop by repeating its
	// first point.
	Outlines [][]mesh.Point

	// View zooms onto a window of the r-z plane; nil shows the whole mesh.
	View *Window
}

// colorScale maps values onto [0, 1] for the colour map. On a log scale lo and hi are base-10 logarithms.
type colorScale struct {
	lo, hi float64
	log    bool
}

// frac returns the position of v on the scale, clamped to [0, 1]; NaN stays NaN.
func (s colorScale) frac(v float64) float64 {
	if math.IsNaN(v) {
		return v
	}
	if s.log {
		if v <= 0 {
			return 0
		}
		v = math.Log10(v)
	}
	return math.Min(1, math.Max(0, (v-s.lo)/(s.hi-s.lo)))
}

// newColorScale chooses the scale for vals from the spec.
func newColorScale(vals []float64, spec *FieldSpec) (colorScale, error) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range vals {
		if math.IsInf(v, 0) {
			return colorScale{}, errors.New("plot: field map: infinite value")
		}
		if v == v && (!spec.Log || v > 0) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	fixed := spec.Max > spec.Min
	if !spec.Log {
		if fixed {
			lo, hi = spec.Min, spec.Max
		}
		if lo > hi {
			return colorScale{}, errors.New("plot: field map: no finite values")
		}
		if lo == hi {
			d := math.Max(math.Abs(lo)*1e-3, 1e-300)
			lo, hi = lo-d, hi+d
		}
		return colorScale{lo: lo, hi: hi}, nil
	}
	if fixed {
		if spec.Min <= 0 {
			return colorScale{}, fmt.Errorf("plot: field map: log scale needs Min > 0, have %g", spec.Min)
		}
		return colorScale{lo: math.Log10(spec.Min), hi: math.Log10(spec.Max), log: true}, nil
	}
	if lo > hi {
		return colorScale{}, errors.New("plot: field map: log scale needs a positive value")
	}
	dec := spec.Decades
	if dec == 0 {
		dec = 4
	}
	if !(dec > 0) {
		return colorScale{}, fmt.Errorf("plot: field map: decades %g must be positive", spec.Decades)
	}
	top := math.Log10(hi)
	return colorScale{lo: top - dec, hi: top, log: true}, nil
}

// FieldMap draws the mesh's triangles filled by value, with flux lines, outlines and a colour bar; axes are in
// millimetres at equal scale. Save the result with Save.
func FieldMap(m *mesh.Mesh, spec FieldSpec) (*Figure, error) {
	if (spec.CellValues == nil) == (spec.NodeValues == nil) {
		return nil, errors.New("plot: field map: give exactly one of CellValues and NodeValues")
	}
	if spec.CellValues != nil && len(spec.CellValues) != len(m.Tris) {
		return nil, fmt.Errorf("plot: field map: %d cell values for %d triangles", len(spec.CellValues), len(m.Tris))
	}
	if spec.NodeValues != nil && len(spec.NodeValues) != len(m.Nodes) {
		return nil, fmt.Errorf("plot: field map: %d node values for %d nodes", len(spec.NodeValues), len(m.Nodes))
	}
	if len(m.Tris) == 0 {
		return nil, errors.New("plot: field map: empty mesh")
	}
	vals := spec.CellValues
	tris := m.Tris
	if spec.NodeValues != nil {
		tris = linearTris(m)
		vals = make([]float64, len(tris))
		for i, t := range tris {
			vals[i] = (spec.NodeValues[t[0]] + spec.NodeValues[t[1]] + spec.NodeValues[t[2]]) / 3
		}
	}
	sc, err := newColorScale(vals, &spec)
	if err != nil {
		return nil, err
	}
	view, err := viewMM(m, spec.View)
	if err != nil {
		return nil, err
	}
	fig := newFigure(spec.Title, view)
	cm := NewColorMap(sc.lo, sc.hi)
	fill := &triFill{cm: cm, xy: make([]float64, 0, 6*len(tris)), bin: make([]uint8, 0, len(tris))}
	for i, t := range tris {
		fr := sc.frac(vals[i])
		if math.IsNaN(fr) {
			continue
		}
		for _, v := range t {
			p := m.Nodes[v]
			fill.xy = append(fill.xy, 1e3*p.X, 1e3*p.Y)
		}
		fill.bin = append(fill.bin, uint8(index(fr)))
	}
	fig.Plot.Add(fill)
	fig.fill = fill
	if spec.Flux != nil {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, v := range spec.Flux {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		n := spec.FluxLines
		if n == 0 {
			n = 20
		}
		iso, err := Isolines(m, spec.Flux, EvenLevels(lo, hi, n))
		if err != nil {
			return nil, fmt.Errorf("plot: field map: flux lines: %w", err)
		}
		fl := &polylines{style: draw.LineStyle{Color: color.NRGBA{R: 150, G: 205, B: 225, A: 230}, Width: vg.Points(0.7)}}
		for _, l := range iso {
			fl.add(l.Lines)
		}
		fig.Plot.Add(fl)
	}
	if len(spec.Outlines) > 0 {
		ol := &polylines{style: draw.LineStyle{Color: color.NRGBA{R: 175, G: 175, B: 175, A: 255}, Width: vg.Points(1.0)}}
		ol.add(spec.Outlines)
		fig.Plot.Add(ol)
	}
	fig.bar = &colorBar{cm: cm, scale: sc, unit: spec.Unit}
	return fig, nil
}

// viewMM returns the window to show in millimetres: the given one or the mesh's bounding box.
func viewMM(m *mesh.Mesh, w *Window) ([4]float64, error) {
	if w != nil {
		if !w.valid() {
			return [4]float64{}, fmt.Errorf("plot: empty or invalid view window %+v", *w)
		}
		return [4]float64{1e3 * w.RMin, 1e3 * w.RMax, 1e3 * w.ZMin, 1e3 * w.ZMax}, nil
	}
	b := [4]float64{math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)}
	for _, t := range m.Tris {
		for _, v := range t {
			p := m.Nodes[v]
			b[0], b[1] = math.Min(b[0], p.X), math.Max(b[1], p.X)
			b[2], b[3] = math.Min(b[2], p.Y), math.Max(b[3], p.Y)
		}
	}
	if !(b[1] > b[0] && b[3] > b[2]) {
		return [4]float64{}, errors.New("plot: mesh has no area")
	}
	return [4]float64{1e3 * b[0], 1e3 * b[1], 1e3 * b[2], 1e3 * b[3]}, nil
}

// triFill is a plot.Plotter that fills triangles with colours of a ColorMap. Triangles are grouped by colour
// and each group is filled as one path, which is fast on every back end and leaves no seams between
// neighbours of the same colour; a hairline stroke in the group's colour covers the seams between groups.
// Triangles outside the axis ranges are skipped and those across the border are clipped.
type triFill struct {
	cm  *ColorMap
	xy  []float64 // corners in mm, 6 numbers per triangle
	bin []uint8   // colour index per triangle
	// seam is the width of the covering stroke (0 for the default 0.3 pt, negative for none).
	seam vg.Length
}

// rasterCanvas is what a bitmap back end (vgimg, used for PNG) offers besides vg.Canvas.
type rasterCanvas interface {
	Image() stddraw.Image
	DPI() float64
}

// Plot implements plot.Plotter. On a bitmap canvas the triangles are scan-converted straight into the image
// (no anti-aliasing, hence no seams, and fast for hundreds of thousands of triangles); on vector back ends
// they are filled as paths.
func (tf *triFill) Plot(c draw.Canvas, p *plot.Plot) {
	if rc, ok := baseCanvas(c).(rasterCanvas); ok && tf.cm.alpha == 1 {
		if img, ok := rc.Image().(*image.RGBA); ok && img.Bounds().Min == (image.Point{}) {
			tf.raster(c, p, img, rc.DPI()/72)
			return
		}
	}
	var groups [lutSize]vg.Path
	xmin, xmax, ymin, ymax := p.X.Min, p.X.Max, p.Y.Min, p.Y.Max
	trX, trY := p.Transforms(&c)
	var pts [3]vg.Point
	for i, b := range tf.bin {
		xy := tf.xy[6*i : 6*i+6]
		x0, x1 := min(xy[0], xy[2], xy[4]), max(xy[0], xy[2], xy[4])
		y0, y1 := min(xy[1], xy[3], xy[5]), max(xy[1], xy[3], xy[5])
		if x1 < xmin || x0 > xmax || y1 < ymin || y0 > ymax {
			continue
		}
		for k := range 3 {
			pts[k] = vg.Point{X: trX(xy[2*k]), Y: trY(xy[2*k+1])}
		}
		poly := pts[:]
		if x0 < xmin || x1 > xmax || y0 < ymin || y1 > ymax {
			poly = c.ClipPolygonXY(poly)
			if len(poly) < 3 {
				continue
			}
		}
		g := &groups[b]
		g.Move(poly[0])
		for _, q := range poly[1:] {
			g.Line(q)
		}
		g.Close()
	}
	seam := tf.seam
	if seam == 0 {
		seam = vg.Points(0.3)
	}
	for i := range groups {
		if len(groups[i]) == 0 {
			continue
		}
		col := tf.cm.color(i)
		c.SetColor(col)
		c.Fill(groups[i])
		if seam > 0 {
			c.SetLineStyle(draw.LineStyle{Color: col, Width: seam})
			c.Stroke(groups[i])
		}
	}
}

// baseCanvas returns the back-end canvas under c: draw.Crop nests draw.Canvas values inside each other.
func baseCanvas(c draw.Canvas) vg.Canvas {
	v := c.Canvas
	for {
		switch dc := v.(type) {
		case draw.Canvas:
			v = dc.Canvas
		case *draw.Canvas:
			v = dc.Canvas
		default:
			return v
		}
	}
}

// raster fills the triangles into img, whose pixels are dots = points × scale with y pointing down (the
// vgimg convention). A pixel takes a triangle's colour when its centre lies in the triangle (closed, with a
// tiny tolerance), so triangles sharing an edge leave no unpainted pixels between them. Pixels outside the
// data area c are left alone.
func (tf *triFill) raster(c draw.Canvas, p *plot.Plot, img *image.RGBA, scale float64) {
	xmin, xmax, ymin, ymax := p.X.Min, p.X.Max, p.Y.Min, p.Y.Max
	trX, trY := p.Transforms(&c)
	H := float64(img.Bounds().Dy())
	// Pixel index ranges whose centres lie inside the data area.
	ci0 := int(math.Ceil(float64(c.Min.X)*scale - 0.5))
	ci1 := int(math.Floor(float64(c.Max.X)*scale-0.5)) + 1
	cj0 := int(math.Ceil(H - float64(c.Max.Y)*scale - 0.5))
	cj1 := int(math.Floor(H-float64(c.Min.Y)*scale-0.5)) + 1
	ci0, cj0 = max(ci0, 0), max(cj0, 0)
	ci1, cj1 = min(ci1, img.Bounds().Dx()), min(cj1, img.Bounds().Dy())
	var rgba [lutSize][4]uint8
	for i := range rgba {
		col := tf.cm.color(i)
		rgba[i] = [4]uint8{col.R, col.G, col.B, 255}
	}
	const eps = 1e-7
	var px, py [3]float64
	for t, b := range tf.bin {
		xy := tf.xy[6*t : 6*t+6]
		if max(xy[0], xy[2], xy[4]) < xmin || min(xy[0], xy[2], xy[4]) > xmax ||
			max(xy[1], xy[3], xy[5]) < ymin || min(xy[1], xy[3], xy[5]) > ymax {
			continue
		}
		for k := range 3 {
			px[k] = float64(trX(xy[2*k])) * scale
			py[k] = H - float64(trY(xy[2*k+1]))*scale
		}
		j0 := max(cj0, int(math.Ceil(min(py[0], py[1], py[2])-0.5-eps)))
		j1 := min(cj1, int(math.Floor(max(py[0], py[1], py[2])-0.5+eps))+1)
		col := rgba[b]
		for j := j0; j < j1; j++ {
			yc := float64(j) + 0.5
			xl, xr := math.Inf(1), math.Inf(-1)
			for k := range 3 {
				xa, ya, xb, yb := px[k], py[k], px[(k+1)%3], py[(k+1)%3]
				if ya > yb { // the same formula for an edge from either side: bit-identical crossings
					xa, ya, xb, yb = xb, yb, xa, ya
				}
				if yc < ya-eps || yc > yb+eps {
					continue
				}
				var x0, x1 float64
				if yb-ya <= eps {
					x0, x1 = min(xa, xb), max(xa, xb)
				} else {
					s := math.Min(1, math.Max(0, (yc-ya)/(yb-ya)))
					x0 = xa + s*(xb-xa)
					x1 = x0
				}
				xl, xr = math.Min(xl, x0), math.Max(xr, x1)
			}
			i0 := max(ci0, int(math.Ceil(xl-0.5-eps)))
			i1 := min(ci1, int(math.Floor(xr-0.5+eps))+1)
			if i0 >= i1 {
				continue
			}
			row := img.Pix[j*img.Stride+4*i0 : j*img.Stride+4*i1]
			for q := 0; q < len(row); q += 4 {
				copy(row[q:q+4], col[:])
			}
		}
	}
}

// DataRange implements plot.DataRanger.
func (tf *triFill) DataRange() (xmin, xmax, ymin, ymax float64) {
	return rangeOf(tf.xy)
}

func rangeOf(xy []float64) (xmin, xmax, ymin, ymax float64) {
	xmin, xmax, ymin, ymax = math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
	for i := 0; i+1 < len(xy); i += 2 {
		xmin, xmax = math.Min(xmin, xy[i]), math.Max(xmax, xy[i])
		ymin, ymax = math.Min(ymin, xy[i+1]), math.Max(ymax, xy[i+1])
	}
	return
}

// polylines is a plot.Plotter stroking polylines given in mm, clipped to the axis ranges.
type polylines struct {
	style draw.LineStyle
	lines [][]float64 // x0, y0, x1, y1, ... in mm
}

// add appends polylines given in metres.
func (pl *polylines) add(lines [][]mesh.Point) {
	for _, l := range lines {
		if len(l) < 2 {
			continue
		}
		xy := make([]float64, 0, 2*len(l))
		for _, p := range l {
			xy = append(xy, 1e3*p.X, 1e3*p.Y)
		}
		pl.lines = append(pl.lines, xy)
	}
}

// Plot implements plot.Plotter.
func (pl *polylines) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	var vl [][]vg.Point
	for _, xy := range pl.lines {
		pts := make([]vg.Point, len(xy)/2)
		for i := range pts {
			pts[i] = vg.Point{X: trX(xy[2*i]), Y: trY(xy[2*i+1])}
		}
		vl = append(vl, pts)
	}
	// One path for all lines: a single stroke call, however many lines there are.
	var path vg.Path
	for _, l := range c.ClipLinesXY(vl...) {
		if len(l) < 2 {
			continue
		}
		path.Move(l[0])
		for _, q := range l[1:] {
			path.Line(q)
		}
	}
	if len(path) > 0 {
		c.SetLineStyle(pl.style)
		c.Stroke(path)
	}
}
