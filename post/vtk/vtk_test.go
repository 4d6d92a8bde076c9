package vtk

import (
	"bufio"
	"bytes"
	"errors"
	"io"
	"math"
	"math/rand"
	"strconv"
	"strings"
	"testing"

	"eddyrz/mesh"
)

// legacy is what parseLegacy reads back from a VTK legacy ASCII unstructured grid.
type legacy struct {
	points [][3]float64
	cells  [][]int
	types  []int
	arrays map[string][]float64 // "point:NAME" or "cell:NAME"; vectors flattened (x, y, z, ...)
	kinds  map[string]string    // "SCALARS" or "VECTORS"
}

// parseLegacy is a small independent reader of the subset of the format we write, following the section
// layout of the VTK file formats document (header, ASCII, DATASET, POINTS, CELLS, CELL_TYPES, POINT_DATA,
// CELL_DATA with SCALARS/LOOKUP_TABLE and VECTORS).
func parseLegacy(t *testing.T, data []byte) legacy {
	t.Helper()
	// The first two lines are free text: skip them by lines.
	lines := strings.SplitN(string(data), "\n", 3)
	if !strings.HasPrefix(lines[0], "# vtk DataFile Version") {
		t.Fatalf("bad header %q", lines[0])
	}
	sc := bufio.NewScanner(strings.NewReader(lines[2]))
	sc.Buffer(nil, 1<<20)
	sc.Split(bufio.ScanWords)
	word := func() string {
		if !sc.Scan() {
			t.Fatal("unexpected end of file")
		}
		return sc.Text()
	}
	num := func() float64 {
		v, err := strconv.ParseFloat(word(), 64)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	integer := func() int {
		v, err := strconv.Atoi(word())
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	expect := func(w string) {
		if got := word(); got != w {
			t.Fatalf("read %q, want %q", got, w)
		}
	}
	var l legacy
	l.arrays, l.kinds = map[string][]float64{}, map[string]string{}
	expect("ASCII")
	expect("DATASET")
	expect("UNSTRUCTURED_GRID")
	expect("POINTS")
	np := integer()
	expect("double")
	for range np {
		l.points = append(l.points, [3]float64{num(), num(), num()})
	}
	expect("CELLS")
	nc, size := integer(), integer()
	total := 0
	for range nc {
		n := integer()
		c := make([]int, n)
		for i := range c {
			c[i] = integer()
		}
		l.cells = append(l.cells, c)
		total += n + 1
	}
	if total != size {
		t.Fatalf("CELLS size %d, counted %d", size, total)
	}
	expect("CELL_TYPES")
	if integer() != nc {
		t.Fatal("CELL_TYPES count differs")
	}
	for range nc {
		l.types = append(l.types, integer())
	}
	where, count := "", 0
	for sc.Scan() {
		switch kw := sc.Text(); kw {
		case "POINT_DATA":
			where, count = "point", integer()
		case "CELL_DATA":
			where, count = "cell", integer()
		case "SCALARS":
			name := word()
			word() // data type
			if comps := integer(); comps != 1 {
				t.Fatalf("%d components", comps)
			}
			expect("LOOKUP_TABLE")
			expect("default")
			v := make([]float64, count)
			for i := range v {
				v[i] = num()
			}
			l.arrays[where+":"+name], l.kinds[where+":"+name] = v, "SCALARS"
		case "VECTORS":
			name := word()
			word()
			v := make([]float64, 3*count)
			for i := range v {
				v[i] = num()
			}
			l.arrays[where+":"+name], l.kinds[where+":"+name] = v, "VECTORS"
		default:
			t.Fatalf("unexpected keyword %q", kw)
		}
	}
	return l
}

// square returns two counter-clockwise triangles on the unit square, with tags 3 and 4; quadratic adds
// midpoint nodes.
func square(quadratic bool) *mesh.Mesh {
	m := &mesh.Mesh{
		Nodes:       []mesh.Point{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: 1, Y: 1}, {X: 0, Y: 1}},
		NumVertices: 4,
		Tris:        [][3]int32{{0, 1, 2}, {0, 2, 3}},
		Tags:        []int32{3, 4},
	}
	if quadratic {
		// Midpoints, deliberately numbered out of geometric order: 01, 12, 20(diag), 23, 30.
		m.Nodes = append(m.Nodes, mesh.Point{X: 0.5, Y: 1}, mesh.Point{X: 0.5, Y: 0}, mesh.Point{X: 0.5, Y: 0.5},
			mesh.Point{X: 1, Y: 0.5}, mesh.Point{X: 0, Y: 0.5})
		// Node 4 = (0.5, 1) on edge 2-3, 5 = (0.5, 0) on 0-1, 6 = diagonal, 7 = (1, 0.5) on 1-2, 8 = (0, 0.5) on 3-0.
		m.Mid = [][3]int32{{5, 7, 6}, {6, 4, 8}}
	}
	return m
}

func TestWriteLinear(t *testing.T) {
	m := square(false)
	temp := []float64{300, 301.5, 1e-17, -2.25}
	a := []complex128{complex(1e-3, -2e-4), complex(0, 1)}
	f := [][2]float64{{1, 2}, {3, 4}, {5, 6}, {7, 8}}
	b := [][2]complex128{{complex(1, 2), complex(3, 4)}, {complex(5, 6), complex(7, 8)}}
	var buf bytes.Buffer
	err := WriteUnstructured(&buf, m, []Field{Scalar("T", temp), Vector("f", f)},
		[]Field{Complex("A", a), ComplexVector("B", b)})
	if err != nil {
		t.Fatal(err)
	}
	l := parseLegacy(t, buf.Bytes())
	if len(l.points) != 4 || len(l.cells) != 2 {
		t.Fatalf("%d points, %d cells", len(l.points), len(l.cells))
	}
	if l.points[2] != [3]float64{1, 1, 0} {
		t.Errorf("point 2 = %v, want (r, z, 0) = (1, 1, 0)", l.points[2])
	}
	for i, c := range l.cells {
		if l.types[i] != 5 || len(c) != 3 || c[0] != int(m.Tris[i][0]) || c[2] != int(m.Tris[i][2]) {
			t.Errorf("cell %d = %v type %d", i, c, l.types[i])
		}
	}
	want := map[string][]float64{
		"point:T":     temp,
		"point:f":     {1, 2, 0, 3, 4, 0, 5, 6, 0, 7, 8, 0},
		"cell:region": {3, 4},
		"cell:A_re":   {1e-3, 0},
		"cell:A_im":   {-2e-4, 1},
		"cell:B_re":   {1, 3, 0, 5, 7, 0},
		"cell:B_im":   {2, 4, 0, 6, 8, 0},
	}
	if len(l.arrays) != len(want) {
		t.Errorf("arrays %v", l.kinds)
	}
	for k, w := range want {
		got := l.arrays[k]
		if len(got) != len(w) {
			t.Errorf("%s: %v, want %v", k, got, w)
			continue
		}
		for i := range w {
			if got[i] != w[i] { // shortest round-trip formatting: exact
				t.Errorf("%s[%d] = %v, want %v", k, i, got[i], w[i])
			}
		}
	}
	if l.kinds["cell:B_re"] != "VECTORS" || l.kinds["cell:A_re"] != "SCALARS" {
		t.Errorf("kinds %v", l.kinds)
	}
}

// VTK_QUADRATIC_TRIANGLE (22) lists the corners, then the midpoints of edges (0,1), (1,2), (2,0) (VTK class
// documentation of vtkQuadraticTriangle). Check it geometrically: written node 3+k must be the midpoint of
// written corners k and k+1.
func TestWriteQuadraticNodeOrder(t *testing.T) {
	m := square(true)
	var buf bytes.Buffer
	if err := WriteUnstructured(&buf, m, nil, nil); err != nil {
		t.Fatal(err)
	}
	l := parseLegacy(t, buf.Bytes())
	if len(l.points) != 9 {
		t.Fatalf("%d points", len(l.points))
	}
	for i, c := range l.cells {
		if l.types[i] != 22 || len(c) != 6 {
			t.Fatalf("cell %d: type %d, %d nodes", i, l.types[i], len(c))
		}
		for k := range 3 {
			a, b, mid := l.points[c[k]], l.points[c[(k+1)%3]], l.points[c[3+k]]
			if mid[0] != (a[0]+b[0])/2 || mid[1] != (a[1]+b[1])/2 {
				t.Errorf("cell %d node %d = %v, not the midpoint of %v and %v", i, 3+k, mid, a, b)
			}
		}
	}
}

// Property: random values, including extreme magnitudes, read back bit for bit.
func TestWriteRoundTripProperty(t *testing.T) {
	rng := rand.New(rand.NewSource(3))
	m := square(true)
	for range 50 {
		v := make([]float64, len(m.Nodes))
		for i := range v {
			v[i] = rng.NormFloat64() * math.Pow(10, float64(rng.Intn(600)-300))
		}
		var buf bytes.Buffer
		if err := WriteUnstructured(&buf, m, []Field{Scalar("v", v)}, nil); err != nil {
			t.Fatal(err)
		}
		got := parseLegacy(t, buf.Bytes()).arrays["point:v"]
		for i := range v {
			if got[i] != v[i] {
				t.Fatalf("value %d: wrote %v, read %v", i, v[i], got[i])
			}
		}
	}
}

type failWriter struct{}

func (failWriter) Write([]byte) (int, error) { return 0, errors.New("disk full") }

func TestWriteErrors(t *testing.T) {
	m := square(false)
	four := []float64{1, 2, 3, 4}
	tests := []struct {
		name        string
		point, cell []Field
	}{
		{"short point field", []Field{Scalar("x", four[:3])}, nil},
		{"short cell field", nil, []Field{Scalar("x", four)}},
		{"empty name", []Field{Scalar("", four)}, nil},
		{"space in name", []Field{Scalar("a b", four)}, nil},
		{"duplicate", []Field{Scalar("x", four)}, []Field{Scalar("x", four[:2])}},
		{"duplicate after suffix", []Field{Complex("a", make([]complex128, 4)), Scalar("a_im", four)}, nil},
		{"region taken", nil, []Field{Scalar("region", four[:2])}},
		{"unset field", []Field{{Name: "x"}}, nil},
		{"NaN", []Field{Scalar("x", []float64{1, math.NaN(), 3, 4})}, nil},
		{"Inf in vector", nil, []Field{Vector("x", [][2]float64{{1, math.Inf(1)}, {0, 0}})}},
	}
	for _, tc := range tests {
		if err := WriteUnstructured(io.Discard, m, tc.point, tc.cell); err == nil {
			t.Errorf("%s: accepted", tc.name)
		}
	}
	bad := square(false)
	bad.Tris[1][2] = 9
	if err := WriteUnstructured(io.Discard, bad, nil, nil); err == nil {
		t.Error("out-of-range node accepted")
	}
	if err := WriteUnstructured(io.Discard, &mesh.Mesh{}, nil, nil); err == nil {
		t.Error("empty mesh accepted")
	}
	if err := WriteUnstructured(failWriter{}, m, []Field{Scalar("x", four)}, nil); err == nil {
		t.Error("write error lost")
	}
}

func BenchmarkWriteUnstructured(b *testing.B) {
	for _, n := range []int{10, 70, 220} { // 200, ~10k, ~100k triangles
		m := &mesh.Mesh{}
		for j := 0; j <= n; j++ {
			for i := 0; i <= n; i++ {
				m.Nodes = append(m.Nodes, mesh.Point{X: float64(i) / float64(n) * 0.1, Y: float64(j) / float64(n) * 0.1})
			}
		}
		for j := range n {
			for i := range n {
				a := int32(j*(n+1) + i)
				m.Tris = append(m.Tris, [3]int32{a, a + 1, a + int32(n) + 2}, [3]int32{a, a + int32(n) + 2, a + int32(n) + 1})
				m.Tags = append(m.Tags, 1, 1)
			}
		}
		a := make([]complex128, len(m.Nodes))
		for i := range a {
			a[i] = complex(math.Sin(float64(i)), math.Cos(float64(i)))
		}
		q := make([]float64, len(m.Tris))
		for i := range q {
			q[i] = 1e6 * math.Exp(-float64(i)/1e4)
		}
		b.Run(strconv.Itoa(len(m.Tris))+"tris", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if err := WriteUnstructured(io.Discard, m, []Field{Complex("A", a)}, []Field{Scalar("q", q)}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
