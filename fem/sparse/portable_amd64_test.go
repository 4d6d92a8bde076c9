//go:build amd64

package sparse

import "testing"

// TestPortableFactorBitwise: with the vector kernels switched off, the factorisation (portable tile code, as on
// other architectures) is bitwise the one the kernels give. Not parallel: it flips the process-wide kernel switch.
func TestPortableFactorBitwise(t *testing.T) {
	if !hasAVX2FMA {
		t.Skip("no AVX2+FMA here: both runs would take the portable path")
	}
	a, xy, _ := newAxi(40, 2).build()
	s, err := Analyze(a, Options{Coords: xy})
	if err != nil {
		t.Fatal(err)
	}
	vec, err := s.factor(a, 2)
	if err != nil {
		t.Fatal(err)
	}
	hasAVX2FMA = false
	defer func() { hasAVX2FMA = true }()
	port, err := s.factor(a, 2)
	if err != nil {
		t.Fatal(err)
	}
	for i := range vec.lx {
		if vec.lx[i] != port.lx[i] {
			t.Fatalf("L entry %d: vector %v, portable %v", i, vec.lx[i], port.lx[i])
		}
	}
}

// TestPortableSolveBitwise: with the vector kernels switched off, the substitutions (portable code, as on other
// architectures) give bitwise the solution the kernels give. Not parallel: it flips the process-wide switch.
func TestPortableSolveBitwise(t *testing.T) {
	if !hasAVX2FMA {
		t.Skip("no AVX2+FMA here: both runs would take the portable path")
	}
	a, xy, rhs := newAxi(40, 2).build()
	s, err := Analyze(a, Options{Coords: xy})
	if err != nil {
		t.Fatal(err)
	}
	f, err := s.Factor(a)
	if err != nil {
		t.Fatal(err)
	}
	vec := make([]complex128, a.N)
	f.Apply(vec, rhs)
	hasAVX2FMA = false
	defer func() { hasAVX2FMA = true }()
	port := make([]complex128, a.N)
	f.Apply(port, rhs)
	for i := range vec {
		if vec[i] != port[i] {
			t.Fatalf("x[%d]: vector %v, portable %v", i, vec[i], port[i])
		}
	}
}
