package study

import (
	"fmt"
	"math"
	"math/cmplx"

	"eddyrz/fem"
	"eddyrz/mesh"
	"eddyrz/post/plot"
)

// CellFields are per-triangle averages of the field at the job's drive level: Joule power density (W/m³, 0 in
// air) and flux density magnitude √(|B_r|²+|B_z|²) (T rms), each the weighted mean over the triangle's
// quadrature points.
type CellFields struct {
	Joule, B []float64
}

// Cells returns the per-triangle fields of the solution, scaled to the job's drive level.
func (s *Solution) Cells() CellFields {
	m := s.Field.Mesh
	n := len(m.Tris)
	cf := CellFields{Joule: make([]float64, n), B: make([]float64, n)}
	w := make([]float64, n)
	k2 := sq(cmplx.Abs(s.Scale))
	s.Field.EachPoint(func(q fem.QuadPoint) {
		w[q.Elem] += q.Weight
		if q.Region >= 0 && q.Sigma > 0 && s.Field.Regions[q.Region].Kind != fem.Stranded {
			cf.Joule[q.Elem] += q.Weight * sq(cmplx.Abs(q.J)) / q.Sigma * k2
		}
		cf.B[q.Elem] += q.Weight * (sq(cmplx.Abs(q.Br)) + sq(cmplx.Abs(q.Bz))) * k2
	})
	for t := range w {
		if w[t] > 0 {
			cf.Joule[t] /= w[t]
			cf.B[t] = math.Sqrt(cf.B[t] / w[t])
		}
	}
	return cf
}

// FluxFunction returns 2πr·Re{A} at every node (Wb, at the job's drive level): its contours are flux lines at
// the instant the coil current phasor is real.
func (s *Solution) FluxFunction() []float64 {
	m := s.Field.Mesh
	f := make([]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		f[i] = 2 * math.Pi * p.X * real(s.Field.A[i]*s.Scale)
	}
	return f
}

// Outlines returns the boundaries between regions of different tags (coil turns, parts), as two-point polylines
// in metres, for drawing over a field map.
func Outlines(m *mesh.Mesh) [][]mesh.Point {
	nb := m.Neighbors()
	var out [][]mesh.Point
	for t, tri := range m.Tris {
		for k := 0; k < 3; k++ {
			o := nb[t][k]
			// Each interface edge once: from the higher-tagged side, or from the only side on the boundary.
			if (o < 0 && m.Tags[t] > 1) || (o >= 0 && m.Tags[o] < m.Tags[t]) {
				a, b := m.Nodes[tri[k]], m.Nodes[tri[(k+1)%3]]
				if o < 0 && a.X == 0 && b.X == 0 {
					continue
				}
				out = append(out, []mesh.Point{a, b})
			}
		}
	}
	return out
}

// FigureOptions choose what a field map shows.
type FigureOptions struct {
	Log  bool         // logarithmic colour scale for the Joule power density
	View *plot.Window // zoom window in metres; nil shows the coil and parts with a margin
}

// Figures returns the two field maps of a solve: Joule power density and |B|, each with flux lines and
// conductor outlines.
func (s *Solution) Figures(opt FigureOptions) (joule, flux *plot.Figure, err error) {
	cf := s.Cells()
	m := s.Field.Mesh
	view := opt.View
	if view == nil {
		view = s.Model.ConductorWindow(0.25)
	}
	outl := Outlines(m)
	ff := s.FluxFunction()
	name := s.Model.Job.Name
	freq := formatFrequency(s.Field.Frequency)
	joule, err = plot.FieldMap(m, plot.FieldSpec{
		Title: fmt.Sprintf("%s, %s: Joule power density", name, freq), Unit: "W/m³",
		CellValues: cf.Joule, Log: opt.Log, Flux: ff, FluxLines: 24, Outlines: outl, View: view,
	})
	if err != nil {
		return nil, nil, fmt.Errorf("power density map: %w", err)
	}
	flux, err = plot.FieldMap(m, plot.FieldSpec{
		Title: fmt.Sprintf("%s, %s: flux density |B|", name, freq), Unit: "T rms",
		CellValues: cf.B, Flux: ff, FluxLines: 24, Outlines: outl, View: view,
	})
	if err != nil {
		return nil, nil, fmt.Errorf("flux density map: %w", err)
	}
	return joule, flux, nil
}

// FigureSize returns a page size in centimetres, widthCm wide, whose height fits the default view's aspect
// ratio (r and z share one scale), with room for the title and colour bar.
func (s *Solution) FigureSize(widthCm float64) (w, h float64) {
	v := s.Model.ConductorWindow(0.25)
	if v == nil || v.RMax <= v.RMin {
		return widthCm, widthCm
	}
	aspect := (v.ZMax - v.ZMin) / (v.RMax - v.RMin)
	h = 0.8*widthCm*aspect + 3
	return widthCm, math.Min(math.Max(h, 0.5*widthCm), 2.5*widthCm)
}

// ConductorWindow is the bounding box of every conductor region of the model's mesh, grown by margin times its
// size on each side and starting at r = 0.
func (md *Model) ConductorWindow(margin float64) *plot.Window {
	m := md.Mesh
	w := plot.Window{RMin: 0, RMax: math.Inf(-1), ZMin: math.Inf(1), ZMax: math.Inf(-1)}
	for t, tri := range m.Tris {
		if m.Tags[t] <= 1 {
			continue
		}
		for _, v := range tri {
			p := m.Nodes[v]
			w.RMax = math.Max(w.RMax, p.X)
			w.ZMin, w.ZMax = math.Min(w.ZMin, p.Y), math.Max(w.ZMax, p.Y)
		}
	}
	if math.IsInf(w.RMax, 0) {
		return nil
	}
	// Grow each axis by its own extent, so a tall part does not widen the picture.
	h := w.ZMax - w.ZMin
	w.RMax *= 1 + margin
	w.ZMin -= margin * h
	w.ZMax += margin * h
	return &w
}

// formatFrequency prints a frequency with a fitting prefix.
func formatFrequency(f float64) string {
	switch {
	case f >= 1e6:
		return fmt.Sprintf("%.4g MHz", f/1e6)
	case f >= 1e3:
		return fmt.Sprintf("%.4g kHz", f/1e3)
	}
	return fmt.Sprintf("%.4g Hz", f)
}

func sq(x float64) float64 { return x * x }
