package plot

import (
	"image/color"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"eddyrz/mesh"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

func TestLogScaleClamps(t *testing.T) {
	vals := []float64{1e6, 1e3, 1, 0, -5, math.NaN()}
	tests := []struct {
		name   string
		spec   FieldSpec
		lo, hi float64
		probes map[float64]float64 // value -> expected fraction
	}{
		{"default 4 decades", FieldSpec{Log: true}, 2, 6,
			map[float64]float64{1e6: 1, 1e4: 0.5, 100: 0, 1: 0, 0: 0, -5: 0, 2e7: 1}},
		{"2 decades", FieldSpec{Log: true, Decades: 2}, 4, 6, map[float64]float64{1e5: 0.5, 1e3: 0}},
		{"fixed", FieldSpec{Log: true, Min: 10, Max: 1e3}, 1, 3, map[float64]float64{100: 0.5, 1: 0, 1e6: 1}},
		{"linear", FieldSpec{}, -5, 1e6, map[float64]float64{-5: 0, 1e6: 1}},
		{"linear fixed", FieldSpec{Min: 0, Max: 10}, 0, 10, map[float64]float64{5: 0.5, -5: 0, 11: 1}},
	}
	for _, tc := range tests {
		s, err := newColorScale(vals, &tc.spec)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if math.Abs(s.lo-tc.lo) > 1e-12 || math.Abs(s.hi-tc.hi) > 1e-12 {
			t.Errorf("%s: range [%g, %g], want [%g, %g]", tc.name, s.lo, s.hi, tc.lo, tc.hi)
		}
		for v, want := range tc.probes {
			if got := s.frac(v); math.Abs(got-want) > 1e-12 {
				t.Errorf("%s: frac(%g) = %g, want %g", tc.name, v, got, want)
			}
		}
	}
	for _, bad := range []FieldSpec{{Log: true, Min: -1, Max: 10}, {Log: true, Decades: -2}} {
		if _, err := newColorScale(vals, &bad); err == nil {
			t.Errorf("%+v accepted", bad)
		}
	}
	if _, err := newColorScale([]float64{0, -1}, &FieldSpec{Log: true}); err == nil {
		t.Error("log scale without positive values accepted")
	}
	if _, err := newColorScale([]float64{1, math.Inf(1)}, &FieldSpec{}); err == nil {
		t.Error("infinite value accepted")
	}
}

func TestFieldMapErrors(t *testing.T) {
	m := gridMesh(3, 3, 0.01, 0.01, false)
	cells := make([]float64, len(m.Tris))
	tests := []struct {
		name string
		spec FieldSpec
	}{
		{"no values", FieldSpec{}},
		{"both values", FieldSpec{CellValues: cells, NodeValues: make([]float64, len(m.Nodes))}},
		{"short cells", FieldSpec{CellValues: cells[1:]}},
		{"short nodes", FieldSpec{NodeValues: make([]float64, 2)}},
		{"bad window", FieldSpec{CellValues: cells, View: &Window{RMin: 1, RMax: 0, ZMin: 0, ZMax: 1}}},
		{"short flux", FieldSpec{CellValues: cells, Flux: make([]float64, 3)}},
		{"log of zeros", FieldSpec{CellValues: cells, Log: true}},
	}
	for _, tc := range tests {
		if _, err := FieldMap(m, tc.spec); err == nil {
			t.Errorf("%s: accepted", tc.name)
		}
	}
}

// The filled triangles land where the mesh says, in the colour of their value: render the fill alone on a
// plot without axes (so the data area is the whole image) and read pixels back.
func TestTriFillPixels(t *testing.T) {
	m := gridMesh(4, 4, 1, 1, false) // cells of 0.25; values by column: x-centre of each triangle
	vals := make([]float64, len(m.Tris))
	for i, tr := range m.Tris {
		vals[i] = (m.Nodes[tr[0]].X + m.Nodes[tr[1]].X + m.Nodes[tr[2]].X) / 3
	}
	fig, err := FieldMap(m, FieldSpec{CellValues: vals, Min: 0, Max: 1})
	if err != nil {
		t.Fatal(err)
	}
	fill := fig.fill
	p := plot.New()
	p.HideAxes()
	p.X.Padding, p.Y.Padding = 0, 0
	p.Add(fill)
	// Zoom on r in [0, 500] mm: the right half of the mesh is culled or clipped.
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 500, 0, 1000
	const px = 200
	for _, path := range []string{"raster", "vector"} {
		c := vgimg.NewWith(vgimg.UseWH(px, px), vgimg.UseDPI(72), vgimg.UseBackgroundColor(color.White))
		var vc vg.Canvas = c
		if path == "vector" {
			vc = hideImage{c} // no Image method: triFill falls back to filling paths
		}
		p.Draw(draw.NewCanvas(vc, px, px))
		img := c.Image()
		at := func(x, y float64) color.Color { // data coordinates in mm, image row 0 at the top
			return img.At(int(x/500*px), int((1-y/1000)*px))
		}
		// A point well inside the lower triangle of cell (0, 0): vertices (0,0) (250,0) (250,250).
		checkPixel(t, path, at(200, 50), fill.cm.color(index(250.0*2/3/1000)))
		// The upper triangle of cell (1, 2), split along the other diagonal, at its centroid.
		tr := m.Tris[2*(2*4+1)+1]
		cx := (m.Nodes[tr[0]].X + m.Nodes[tr[1]].X + m.Nodes[tr[2]].X) / 3
		cy := (m.Nodes[tr[0]].Y + m.Nodes[tr[1]].Y + m.Nodes[tr[2]].Y) / 3
		checkPixel(t, path, at(1e3*cx, 1e3*cy), fill.cm.color(index(cx)))
		// Every pixel is covered: the zoom window lies inside the mesh, and no seams let white through.
		b := img.Bounds()
		for y := b.Min.Y + 1; y < b.Max.Y-1; y += 3 {
			for x := b.Min.X + 1; x < b.Max.X-1; x += 3 {
				if r, g, bb, _ := img.At(x, y).RGBA(); r > 0xf000 && g > 0xf000 && bb > 0xf000 {
					t.Fatalf("%s: white pixel at (%d, %d)", path, x, y)
				}
			}
		}
	}
}

// hideImage hides a bitmap canvas's Image method.
type hideImage struct{ vg.Canvas }

func checkPixel(t *testing.T, path string, got color.Color, want color.NRGBA) {
	t.Helper()
	r, g, b, _ := got.RGBA()
	wr, wg, wb, _ := want.RGBA()
	d := func(a, b uint32) int { return int(a>>8) - int(b>>8) }
	if abs(d(r, wr)) > 2 || abs(d(g, wg)) > 2 || abs(d(b, wb)) > 2 {
		t.Errorf("%s: pixel %v, want %v", path, got, want)
	}
}

func abs(x int) int { return max(x, -x) }

// Equal scales: after drawing, one millimetre of r and of z have the same length on the page, the wanted
// window is inside the axis ranges, and r never goes below the axis of symmetry.
func TestFigureEqualAspect(t *testing.T) {
	m := gridMesh(6, 3, 0.06, 0.02, false) // 60 mm × 20 mm
	for _, size := range [][2]vg.Length{{400, 300}, {200, 500}, {600, 150}} {
		fig, err := FieldMap(m, FieldSpec{CellValues: make([]float64, len(m.Tris)), Unit: "T rms"})
		if err != nil {
			t.Fatal(err)
		}
		c := draw.New(vgimg.NewWith(vgimg.UseWH(size[0], size[1]), vgimg.UseDPI(72)))
		fig.Draw(c)
		dc := fig.Plot.DataCanvas(fig.mainCanvas(c))
		p := fig.Plot
		sx := (p.X.Max - p.X.Min) / float64(dc.Max.X-dc.Min.X)
		sy := (p.Y.Max - p.Y.Min) / float64(dc.Max.Y-dc.Min.Y)
		if math.Abs(sx/sy-1) > 1e-9 {
			t.Errorf("size %v: scales %g and %g mm/pt differ", size, sx, sy)
		}
		if p.X.Min != 0 || p.X.Max < 60-1e-9 || p.Y.Min > 1e-9 || p.Y.Max < 20-1e-9 {
			t.Errorf("size %v: ranges r [%g, %g] z [%g, %g] do not cover the mesh from r = 0", size,
				p.X.Min, p.X.Max, p.Y.Min, p.Y.Max)
		}
	}
}

func TestSaveFormats(t *testing.T) {
	dir := t.TempDir()
	m := gridMesh(8, 6, 0.04, 0.03, true)
	flux := nodal(m, func(x, y float64) float64 { return x * x * math.Exp(-300*y*y) })
	joule := nodal(m, func(x, y float64) float64 { return 1e7 * math.Exp(-x/0.004) })
	fm, err := FieldMap(m, FieldSpec{
		Title: "Test billet, 10 kHz", Unit: "W/m³", NodeValues: joule, Log: true, Flux: flux,
		Outlines: [][]mesh.Point{{{X: 0, Y: 0}, {X: 0.02, Y: 0}, {X: 0.02, Y: 0.01}, {X: 0, Y: 0.01}, {X: 0, Y: 0}}},
		View:     &Window{RMin: 0, RMax: 0.03, ZMin: 0, ZMax: 0.03},
	})
	if err != nil {
		t.Fatal(err)
	}
	mp, err := MeshPicture(m, MeshSpec{Title: "mesh", RegionNames: map[int32]string{1: "billet"}})
	if err != nil {
		t.Fatal(err)
	}
	lc, err := Lines(LineSpec{Title: "force", XLabel: "z (mm)", YLabel: "F_z (N)",
		Series: []Series{{Name: "F_z", X: []float64{0, 1, 2}, Y: []float64{3, 1, -1}}}})
	if err != nil {
		t.Fatal(err)
	}
	magic := map[string]string{".png": "\x89PNG", ".svg": "<?xml", ".pdf": "%PDF"}
	var want []string
	for name, d := range map[string]Drawer{"field": fm, "mesh": mp, "lines": lc} {
		for ext, mg := range magic {
			path := filepath.Join(dir, name+ext)
			if err := Save(d, path, 12, 9); err != nil {
				t.Fatalf("%s: %v", path, err)
			}
			b, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			if len(b) < 500 || !strings.HasPrefix(string(b), mg) {
				t.Errorf("%s: %d bytes, starts %q", path, len(b), b[:min(len(b), 8)])
			}
			want = append(want, name+ext)
		}
	}
	// Overwriting works, and bad saves leave neither the target nor a temporary file.
	if err := Save(lc, filepath.Join(dir, "lines.png"), 10, 8); err != nil {
		t.Fatal(err)
	}
	if err := Save(lc, filepath.Join(dir, "lines.bmp"), 10, 8); err == nil {
		t.Error(".bmp accepted")
	}
	if err := Save(lc, filepath.Join(dir, "x.png"), 0, 8); err == nil {
		t.Error("zero width accepted")
	}
	if err := Save(lc, filepath.Join(dir, "nodir", "x.png"), 10, 8); err == nil {
		t.Error("missing directory accepted")
	}
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(ents) != len(want) {
		var names []string
		for _, e := range ents {
			names = append(names, e.Name())
		}
		t.Errorf("directory holds %v, want exactly %v", names, want)
	}
}

// bigMesh returns a structured mesh with about n triangles over a 100 mm × 100 mm square.
func bigMesh(n int) *mesh.Mesh {
	k := int(math.Sqrt(float64(n) / 2))
	return gridMesh(k, k, 0.1, 0.1, false)
}

func BenchmarkFieldMapSavePNG(b *testing.B) {
	dir := b.TempDir()
	for _, n := range []int{1000, 10000, 100000} {
		m := bigMesh(n)
		vals := make([]float64, len(m.Tris))
		for i, tr := range m.Tris {
			p := m.Nodes[tr[0]]
			vals[i] = 1e8 * math.Exp(-(0.1-p.X)/0.005) * (1 + p.Y)
		}
		flux := nodal(m, func(x, y float64) float64 { return x * x * math.Exp(-200*(y-0.05)*(y-0.05)) })
		b.Run(itoa(len(m.Tris)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				fig, err := FieldMap(m, FieldSpec{Title: "bench", Unit: "W/m³", CellValues: vals, Log: true, Flux: flux})
				if err != nil {
					b.Fatal(err)
				}
				if err := Save(fig, filepath.Join(dir, "f.png"), 16, 12); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
