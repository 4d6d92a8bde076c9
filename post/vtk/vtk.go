// Package vtk writes eddyrz meshes and fields as VTK legacy ASCII unstructured grids (file format version
// 3.0, "DATASET UNSTRUCTURED_GRID"), readable by general-purpose scientific visualisation programs.
//
// Conventions: points are written as (r, z, 0) in metres; linear meshes as VTK_TRIANGLE (type 5), quadratic
// ones as VTK_QUADRATIC_TRIANGLE (type 22) with VTK's node order (corners 0-2, then the midpoints of edges
// 0-1, 1-2, 2-0, which is exactly mesh.Mesh's Mid order). A cell field "region" with the region tags is always
// written. Complex phasor fields (RMS) are written as two arrays, NAME_re and NAME_im; in-plane vectors
// (r, z) as 3-vectors (r, z, 0).
package vtk

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"eddyrz/mesh"
)

// VTK cell type numbers (VTK file formats document, "Linear cell types" / "Non-linear cell types").
const (
	cellTriangle          = 5
	cellQuadraticTriangle = 22
)

// Field is one named array of values per point or per cell. Exactly one of the slices is set; make Fields
// with Scalar, Complex, Vector or ComplexVector.
type Field struct {
	Name string
	real []float64
	cplx []complex128
	vec  [][2]float64
	cvec [][2]complex128
}

// Scalar is a real value per point or cell (e.g. temperature in K, Joule density in W/m³).
func Scalar(name string, v []float64) Field { return Field{Name: name, real: v} }

// Complex is a complex phasor per point or cell (e.g. A_φ in Wb/m), written as name_re and name_im.
func Complex(name string, v []complex128) Field { return Field{Name: name, cplx: v} }

// Vector is a real in-plane vector (r, z) per point or cell (e.g. a time-averaged force density in N/m³).
func Vector(name string, v [][2]float64) Field { return Field{Name: name, vec: v} }

// ComplexVector is a complex in-plane vector per point or cell (e.g. the phasor B = (B_r, B_z) in T rms),
// written as the vector arrays name_re and name_im.
func ComplexVector(name string, v [][2]complex128) Field { return Field{Name: name, cvec: v} }

func (f Field) len() int {
	switch {
	case f.real != nil:
		return len(f.real)
	case f.cplx != nil:
		return len(f.cplx)
	case f.vec != nil:
		return len(f.vec)
	case f.cvec != nil:
		return len(f.cvec)
	}
	return -1
}

// WriteUnstructured writes m with the given point fields (one value per mesh node, midpoint nodes included)
// and cell fields (one value per triangle) to w. Field names must be non-empty, without white space, and
// unique (after the _re/_im suffixes, and "region" is taken); values must be finite.
func WriteUnstructured(w io.Writer, m *mesh.Mesh, point []Field, cell []Field) error {
	if len(m.Tris) == 0 {
		return errors.New("vtk: empty mesh")
	}
	if m.Mid != nil && len(m.Mid) != len(m.Tris) {
		return fmt.Errorf("vtk: %d midpoint triples for %d triangles", len(m.Mid), len(m.Tris))
	}
	if len(m.Tags) != 0 && len(m.Tags) != len(m.Tris) {
		return fmt.Errorf("vtk: %d tags for %d triangles", len(m.Tags), len(m.Tris))
	}
	names := map[string]bool{"region": true}
	check := func(fs []Field, n int, where string) error {
		for _, f := range fs {
			if f.Name == "" || strings.ContainsAny(f.Name, " \t\r\n") {
				return fmt.Errorf("vtk: %s field name %q: must be non-empty without spaces", where, f.Name)
			}
			if f.len() != n {
				return fmt.Errorf("vtk: %s field %q has %d values, want %d", where, f.Name, f.len(), n)
			}
			for _, nm := range f.arrayNames() {
				if names[nm] {
					return fmt.Errorf("vtk: duplicate field name %q", nm)
				}
				names[nm] = true
			}
		}
		return nil
	}
	if err := check(point, len(m.Nodes), "point"); err != nil {
		return err
	}
	if err := check(cell, len(m.Tris), "cell"); err != nil {
		return err
	}
	for i, t := range m.Tris {
		for _, v := range t {
			if v < 0 || int(v) >= len(m.Nodes) {
				return fmt.Errorf("vtk: triangle %d refers to node %d of %d", i, v, len(m.Nodes))
			}
		}
		if m.Mid != nil {
			for _, v := range m.Mid[i] {
				if v < 0 || int(v) >= len(m.Nodes) {
					return fmt.Errorf("vtk: triangle %d refers to midpoint node %d of %d", i, v, len(m.Nodes))
				}
			}
		}
	}

	bw := &writer{w: bufio.NewWriterSize(w, 1<<16)}
	bw.str("# vtk DataFile Version 3.0\neddyrz mesh and fields (r, z, 0) in metres\nASCII\nDATASET UNSTRUCTURED_GRID\n")
	bw.str("POINTS " + strconv.Itoa(len(m.Nodes)) + " double\n")
	for _, p := range m.Nodes {
		bw.nums(p.X, p.Y, 0)
	}
	per, typ := 3, cellTriangle
	if m.Mid != nil {
		per, typ = 6, cellQuadraticTriangle
	}
	nt := len(m.Tris)
	bw.str(fmt.Sprintf("\nCELLS %d %d\n", nt, nt*(per+1)))
	for i, t := range m.Tris {
		bw.ints(per, int(t[0]), int(t[1]), int(t[2]))
		if m.Mid != nil {
			md := m.Mid[i]
			bw.str(" ")
			bw.ints(int(md[0]), int(md[1]), int(md[2]))
		}
		bw.str("\n")
	}
	bw.str(fmt.Sprintf("\nCELL_TYPES %d\n", nt))
	typeLine := strconv.Itoa(typ) + "\n"
	for range nt {
		bw.str(typeLine)
	}

	if len(point) > 0 {
		bw.str(fmt.Sprintf("\nPOINT_DATA %d\n", len(m.Nodes)))
		for _, f := range point {
			bw.field(f)
		}
	}
	bw.str(fmt.Sprintf("\nCELL_DATA %d\nSCALARS region int 1\nLOOKUP_TABLE default\n", nt))
	for i := range nt {
		tag := 0
		if len(m.Tags) > 0 {
			tag = int(m.Tags[i])
		}
		bw.ints(tag)
		bw.str("\n")
	}
	for _, f := range cell {
		bw.field(f)
	}
	if bw.err != nil {
		return fmt.Errorf("vtk: %w", bw.err)
	}
	if err := bw.w.Flush(); err != nil {
		return fmt.Errorf("vtk: %w", err)
	}
	return nil
}

func (f Field) arrayNames() []string {
	if f.cplx != nil || f.cvec != nil {
		return []string{f.Name + "_re", f.Name + "_im"}
	}
	return []string{f.Name}
}

// writer accumulates the first error: bad data (a non-finite value) or a failed write.
type writer struct {
	w   *bufio.Writer
	buf []byte
	err error
}

func (w *writer) str(s string) {
	if w.err == nil {
		_, w.err = w.w.WriteString(s)
	}
}

// nums writes one line of numbers in the shortest form that reads back exactly.
func (w *writer) nums(vs ...float64) {
	w.buf = w.buf[:0]
	for i, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			if w.err == nil {
				w.err = fmt.Errorf("non-finite value %g", v)
			}
			return
		}
		if i > 0 {
			w.buf = append(w.buf, ' ')
		}
		w.buf = strconv.AppendFloat(w.buf, v, 'g', -1, 64)
	}
	w.buf = append(w.buf, '\n')
	if w.err == nil {
		_, w.err = w.w.Write(w.buf)
	}
}

func (w *writer) ints(vs ...int) {
	w.buf = w.buf[:0]
	for i, v := range vs {
		if i > 0 {
			w.buf = append(w.buf, ' ')
		}
		w.buf = strconv.AppendInt(w.buf, int64(v), 10)
	}
	if w.err == nil {
		_, w.err = w.w.Write(w.buf)
	}
}

func (w *writer) field(f Field) {
	scalarHead := func(name string) { w.str("SCALARS " + name + " double 1\nLOOKUP_TABLE default\n") }
	vectorHead := func(name string) { w.str("VECTORS " + name + " double\n") }
	switch {
	case f.real != nil:
		scalarHead(f.Name)
		for _, v := range f.real {
			w.nums(v)
		}
	case f.cplx != nil:
		scalarHead(f.Name + "_re")
		for _, v := range f.cplx {
			w.nums(real(v))
		}
		scalarHead(f.Name + "_im")
		for _, v := range f.cplx {
			w.nums(imag(v))
		}
	case f.vec != nil:
		vectorHead(f.Name)
		for _, v := range f.vec {
			w.nums(v[0], v[1], 0)
		}
	case f.cvec != nil:
		vectorHead(f.Name + "_re")
		for _, v := range f.cvec {
			w.nums(real(v[0]), real(v[1]), 0)
		}
		vectorHead(f.Name + "_im")
		for _, v := range f.cvec {
			w.nums(imag(v[0]), imag(v[1]), 0)
		}
	}
}
