package plot

import (
	"fmt"
	"image/color"
	"slices"

	"eddyrz/mesh"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// MeshSpec describes a picture of the mesh itself.
type MeshSpec struct {
	Title string
	// RegionNames names region tags in the legend; a tag without a name is shown as "region <tag>", and tag 0
	// as "untagged".
	RegionNames map[int32]string
	// View zooms onto a window of the r-z plane; nil shows the whole mesh.
	View *Window
}

// MeshPicture draws the triangles of m with thin edges, each region filled in its own colour (RegionColor in
// increasing tag order) and a legend of region names beside the picture; axes in millimetres at equal scale.
// Quadratic meshes are drawn by their corner triangles.
func MeshPicture(m *mesh.Mesh, spec MeshSpec) (*Figure, error) {
	if len(m.Tris) == 0 {
		return nil, fmt.Errorf("plot: mesh picture: empty mesh")
	}
	if len(m.Tags) != len(m.Tris) {
		return nil, fmt.Errorf("plot: mesh picture: %d tags for %d triangles", len(m.Tags), len(m.Tris))
	}
	view, err := viewMM(m, spec.View)
	if err != nil {
		return nil, err
	}
	var tags []int32
	for _, t := range m.Tags {
		if _, found := slices.BinarySearch(tags, t); !found {
			tags = append(tags, t)
			slices.Sort(tags)
		}
	}
	fig := newFigure(spec.Title, view)
	lut := make(map[int32]uint8, len(tags))
	cm := &ColorMap{alpha: 1}
	leg := plot.NewLegend()
	leg.Top, leg.Left = true, true
	for i, tag := range tags {
		if i >= lutSize {
			return nil, fmt.Errorf("plot: mesh picture: more than %d regions", lutSize)
		}
		lut[tag] = uint8(i)
		cm.lut[i] = RegionColor(i)
		name, ok := spec.RegionNames[tag]
		switch {
		case ok:
		case tag == 0:
			name = "untagged"
		default:
			name = fmt.Sprintf("region %d", tag)
		}
		leg.Add(name, swatch(cm.lut[i]))
	}
	fill := &triFill{cm: cm, seam: -1, xy: make([]float64, 0, 6*len(m.Tris)), bin: make([]uint8, len(m.Tris))}
	edges := &polylines{style: draw.LineStyle{Color: color.NRGBA{R: 40, G: 40, B: 48, A: 255}, Width: vg.Points(0.25)}}
	seen := make(map[[2]int32]bool, 2*len(m.Tris))
	for i, t := range m.Tris {
		for k, v := range t {
			p := m.Nodes[v]
			fill.xy = append(fill.xy, 1e3*p.X, 1e3*p.Y)
			a, b := v, t[(k+1)%3]
			if a > b {
				a, b = b, a
			}
			if !seen[[2]int32{a, b}] {
				seen[[2]int32{a, b}] = true
				pa, pb := m.Nodes[a], m.Nodes[b]
				edges.lines = append(edges.lines, []float64{1e3 * pa.X, 1e3 * pa.Y, 1e3 * pb.X, 1e3 * pb.Y})
			}
		}
		fill.bin[i] = lut[m.Tags[i]]
	}
	fig.Plot.Add(fill, edges)
	fig.legend = &leg
	return fig, nil
}

// swatch is a legend thumbnail: a filled square with a thin frame.
type swatch color.NRGBA

// Thumbnail implements plot.Thumbnailer.
func (s swatch) Thumbnail(c *draw.Canvas) {
	r := c.Rectangle
	pts := []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}}
	c.FillPolygon(color.NRGBA(s), pts)
	c.StrokeLines(draw.LineStyle{Color: color.Black, Width: vg.Points(0.4)}, append(pts, pts[0]))
}
