package sparse

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
)

// WriteMatrixMarket writes a as "%%MatrixMarket matrix coordinate complex symmetric": the lower triangle, 1-based,
// one "row col re im" line per entry, with values printed to full float64 precision.
func WriteMatrixMarket(w io.Writer, a *Matrix) error {
	if err := a.check(); err != nil {
		return err
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	fmt.Fprintf(bw, "%%%%MatrixMarket matrix coordinate complex symmetric\n%d %d %d\n", a.N, a.N, a.ColPtr[a.N])
	buf := make([]byte, 0, 96)
	for j := 0; j < a.N; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			buf = buf[:0]
			buf = strconv.AppendInt(buf, int64(a.RowIdx[p])+1, 10)
			buf = append(buf, ' ')
			buf = strconv.AppendInt(buf, int64(j)+1, 10)
			buf = appendComplex(buf, a.Val[p])
			if _, err := bw.Write(buf); err != nil {
				return fmt.Errorf("sparse: write matrix: %w", err)
			}
		}
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("sparse: write matrix: %w", err)
	}
	return nil
}

func appendComplex(buf []byte, v complex128) []byte {
	buf = append(buf, ' ')
	buf = strconv.AppendFloat(buf, real(v), 'g', -1, 64)
	buf = append(buf, ' ')
	buf = strconv.AppendFloat(buf, imag(v), 'g', -1, 64)
	return append(buf, '\n')
}

// WriteVector writes b as "%%MatrixMarket matrix array complex general" with n rows and one column.
func WriteVector(w io.Writer, b []complex128) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	fmt.Fprintf(bw, "%%%%MatrixMarket matrix array complex general\n%d 1\n", len(b))
	buf := make([]byte, 0, 64)
	for _, v := range b {
		buf = appendComplex(buf[:0], v)
		if _, err := bw.Write(buf[1:]); err != nil {
			return fmt.Errorf("sparse: write vector: %w", err)
		}
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("sparse: write vector: %w", err)
	}
	return nil
}

// mmHeader is a parsed Matrix Market banner.
type mmHeader struct {
	format, field, symmetry string
}

// mmReader reads the banner, skips comments and splits data lines into fields without allocating.
type mmReader struct {
	br   *bufio.Reader
	line int
	f    [][]byte
}

func (r *mmReader) next() ([][]byte, error) {
	for {
		b, err := r.br.ReadSlice('\n')
		if err == bufio.ErrBufferFull {
			return nil, fmt.Errorf("sparse: Matrix Market line %d too long", r.line+1)
		}
		if len(b) == 0 && err != nil {
			if err == io.EOF {
				return nil, fmt.Errorf("sparse: Matrix Market data ends early at line %d: %w", r.line, io.ErrUnexpectedEOF)
			}
			return nil, err
		}
		r.line++
		r.f = r.f[:0]
		i := 0
		for i < len(b) {
			for i < len(b) && (b[i] == ' ' || b[i] == '\t' || b[i] == '\r' || b[i] == '\n') {
				i++
			}
			s := i
			for i < len(b) && b[i] != ' ' && b[i] != '\t' && b[i] != '\r' && b[i] != '\n' {
				i++
			}
			if i > s {
				r.f = append(r.f, b[s:i])
			}
		}
		if len(r.f) == 0 || r.f[0][0] == '%' {
			if err != nil {
				return nil, fmt.Errorf("sparse: Matrix Market data ends early at line %d: %w", r.line, io.ErrUnexpectedEOF)
			}
			continue
		}
		return r.f, nil
	}
}

func (r *mmReader) header() (mmHeader, error) {
	b, err := r.br.ReadString('\n')
	if err != nil && b == "" {
		return mmHeader{}, fmt.Errorf("sparse: empty Matrix Market input: %w", err)
	}
	r.line++
	f := bytes.Fields(bytes.ToLower([]byte(b)))
	if len(f) != 5 || string(f[0]) != "%%matrixmarket" || string(f[1]) != "matrix" {
		return mmHeader{}, fmt.Errorf("sparse: not a Matrix Market matrix banner: %q", b)
	}
	return mmHeader{string(f[2]), string(f[3]), string(f[4])}, nil
}

func (r *mmReader) ints(f [][]byte, n int) ([]int, error) {
	if len(f) < n {
		return nil, fmt.Errorf("sparse: Matrix Market line %d: want %d integers", r.line, n)
	}
	out := make([]int, n)
	for i := range out {
		v, err := strconv.Atoi(string(f[i]))
		if err != nil {
			return nil, fmt.Errorf("sparse: Matrix Market line %d: %w", r.line, err)
		}
		out[i] = v
	}
	return out, nil
}

// value parses a real or complex value from f according to the field type.
func (r *mmReader) value(f [][]byte, field string) (complex128, error) {
	want := 1
	if field == "complex" {
		want = 2
	}
	if len(f) != want {
		return 0, fmt.Errorf("sparse: Matrix Market line %d: want %d value fields, got %d", r.line, want, len(f))
	}
	re, err := strconv.ParseFloat(string(f[0]), 64)
	if err != nil {
		return 0, fmt.Errorf("sparse: Matrix Market line %d: %w", r.line, err)
	}
	var im float64
	if want == 2 {
		if im, err = strconv.ParseFloat(string(f[1]), 64); err != nil {
			return 0, fmt.Errorf("sparse: Matrix Market line %d: %w", r.line, err)
		}
	}
	return complex(re, im), nil
}

// symmetryTolerance is the relative mismatch allowed between a(i,j) and a(j,i) when a general matrix is read.
const symmetryTolerance = 1e-12

// ReadMatrixMarket reads a square coordinate matrix with field real, integer or complex and symmetry symmetric
// or general. Duplicate entries are summed. A general matrix must be symmetric (a(i,j) = a(j,i) within a relative
// 1e-12, no conjugation); its lower triangle is kept.
func ReadMatrixMarket(r io.Reader) (*Matrix, error) {
	mr := &mmReader{br: bufio.NewReaderSize(r, 1<<16)}
	h, err := mr.header()
	if err != nil {
		return nil, err
	}
	if h.format != "coordinate" {
		return nil, fmt.Errorf("sparse: Matrix Market format %q unsupported for matrices (want coordinate)", h.format)
	}
	if h.field != "real" && h.field != "complex" && h.field != "integer" {
		return nil, fmt.Errorf("sparse: Matrix Market field %q unsupported", h.field)
	}
	if h.symmetry != "symmetric" && h.symmetry != "general" {
		return nil, fmt.Errorf("sparse: Matrix Market symmetry %q unsupported (hermitian matrices are not complex symmetric)", h.symmetry)
	}
	f, err := mr.next()
	if err != nil {
		return nil, err
	}
	sz, err := mr.ints(f, 3)
	if err != nil {
		return nil, err
	}
	n, nz := sz[0], sz[2]
	if sz[0] != sz[1] || n < 0 || nz < 0 || n > math.MaxInt32 {
		return nil, fmt.Errorf("sparse: Matrix Market size %d×%d with %d entries: need a square matrix", sz[0], sz[1], nz)
	}
	lower := NewTriplet(n, min(nz, 1<<26))
	var upper *Triplet
	if h.symmetry == "general" {
		upper = NewTriplet(n, 0)
	}
	for k := 0; k < nz; k++ {
		f, err := mr.next()
		if err != nil {
			return nil, err
		}
		ij, err := mr.ints(f, 2)
		if err != nil {
			return nil, err
		}
		i, j := ij[0]-1, ij[1]-1
		if i < 0 || j < 0 || i >= n || j >= n {
			return nil, fmt.Errorf("sparse: Matrix Market line %d: index (%d, %d) outside %d×%d", mr.line, i+1, j+1, n, n)
		}
		v, err := mr.value(f[2:], h.field)
		if err != nil {
			return nil, err
		}
		switch {
		case i >= j:
			lower.Add(i, j, v)
		case upper == nil:
			lower.Add(i, j, v) // upper-triangle storage of a symmetric matrix
		default:
			upper.Add(i, j, v)
		}
	}
	a, _ := lower.Compile()
	if upper == nil {
		return a, nil
	}
	u, _ := upper.Compile()
	for j := 0; j < n; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			i := int(a.RowIdx[p])
			if i == j {
				continue
			}
			q := u.Index(i, j)
			var uv complex128
			if q >= 0 {
				uv = u.Val[q]
			}
			if lv := a.Val[p]; cabs(lv-uv) > symmetryTolerance*max(cabs(lv), cabs(uv)) {
				return nil, fmt.Errorf("sparse: general Matrix Market matrix is not symmetric: a(%d,%d)=%v, a(%d,%d)=%v", i+1, j+1, lv, j+1, i+1, uv)
			}
		}
	}
	for j := 0; j < n; j++ {
		for p := u.ColPtr[j]; p < u.ColPtr[j+1]; p++ {
			if i := int(u.RowIdx[p]); a.Index(i, j) < 0 && u.Val[p] != 0 {
				return nil, fmt.Errorf("sparse: general Matrix Market matrix is not symmetric: a(%d,%d)=%v has no partner", j+1, i+1, u.Val[p])
			}
		}
	}
	return a, nil
}

// ReadVector reads a dense n×1 vector stored as "matrix array real|complex general" (or "coordinate" with one
// column, missing entries zero).
func ReadVector(r io.Reader) ([]complex128, error) {
	mr := &mmReader{br: bufio.NewReaderSize(r, 1<<16)}
	h, err := mr.header()
	if err != nil {
		return nil, err
	}
	if h.field != "real" && h.field != "complex" && h.field != "integer" {
		return nil, fmt.Errorf("sparse: Matrix Market field %q unsupported", h.field)
	}
	f, err := mr.next()
	if err != nil {
		return nil, err
	}
	switch h.format {
	case "array":
		sz, err := mr.ints(f, 2)
		if err != nil {
			return nil, err
		}
		if sz[1] != 1 || sz[0] < 0 {
			return nil, fmt.Errorf("sparse: Matrix Market array %d×%d is not a column vector", sz[0], sz[1])
		}
		b := make([]complex128, sz[0])
		for i := range b {
			f, err := mr.next()
			if err != nil {
				return nil, err
			}
			if b[i], err = mr.value(f, h.field); err != nil {
				return nil, err
			}
		}
		return b, nil
	case "coordinate":
		sz, err := mr.ints(f, 3)
		if err != nil {
			return nil, err
		}
		if sz[1] != 1 || sz[0] < 0 {
			return nil, fmt.Errorf("sparse: Matrix Market matrix %d×%d is not a column vector", sz[0], sz[1])
		}
		b := make([]complex128, sz[0])
		for k := 0; k < sz[2]; k++ {
			f, err := mr.next()
			if err != nil {
				return nil, err
			}
			ij, err := mr.ints(f, 2)
			if err != nil {
				return nil, err
			}
			if ij[0] < 1 || ij[0] > len(b) || ij[1] != 1 {
				return nil, fmt.Errorf("sparse: Matrix Market line %d: index out of range", mr.line)
			}
			v, err := mr.value(f[2:], h.field)
			if err != nil {
				return nil, err
			}
			b[ij[0]-1] += v
		}
		return b, nil
	}
	return nil, fmt.Errorf("sparse: Matrix Market format %q unsupported", h.format)
}
