package sparse

import (
	"math"
)

// axiProblem is an invented test scenario: a cylindrical steel-like billet inside a short copper coil, solved
// for A_φ with linear triangles on a structured r-z grid (each cell cut along its rising diagonal). A = 0 on the
// axis and on the box r = R, z = 0, z = Z, so those nodes are not unknowns. Each coil turn is a solid conductor
// with a loop-voltage unknown bordering the matrix (physics.md of the design notes, "Conductors").
type axiProblem struct {
	nr, nz int     // grid nodes along r and z, boundary included
	R, Z   float64 // box size, m
	freq   float64 // Hz
	turns  int     // solid turns (border rows), each carrying current iTurn
	iTurn  complex128
}

const mu0 = 4e-7 * math.Pi

// sigmaAt returns the conductivity at (r, z) and the turn index (−1 outside the turns).
func (p axiProblem) sigmaAt(r, z float64) (float64, int) {
	if r < 0.3*p.R && z > 0.3*p.Z && z < 0.7*p.Z {
		return 1e6, -1 // billet
	}
	if r > 0.4*p.R && r < 0.45*p.R && p.turns > 0 {
		z0, z1 := 0.35*p.Z, 0.65*p.Z
		if z > z0 && z < z1 {
			t := int(float64(p.turns) * (z - z0) / (z1 - z0))
			// gap between turns: the top 20 % of each slot is air
			frac := float64(p.turns)*(z-z0)/(z1-z0) - float64(t)
			if frac < 0.8 {
				return 5.8e7, t
			}
		}
	}
	return 0, -1
}

// build assembles the bordered system. Unknowns are the interior grid nodes (i = 1..nr−2 in r, j = 1..nz−2 in
// z, i fastest) followed by one loop voltage per turn; coords holds the node positions and NaN for the turns.
func (p axiProblem) build() (*Matrix, [][2]float64, []complex128) {
	nr, nz := p.nr, p.nz
	hr, hz := p.R/float64(nr-1), p.Z/float64(nz-1)
	ni, nj := nr-2, nz-2
	nn := ni * nj
	n := nn + p.turns
	id := func(i, j int) int {
		if i <= 0 || j <= 0 || i >= nr-1 || j >= nz-1 {
			return -1
		}
		return (i - 1) + (j-1)*ni
	}
	omega := 2 * math.Pi * p.freq
	nu := 1 / mu0
	t := NewTriplet(n, 9*nn+16)
	c := make([][]complex128, p.turns) // c_i per turn, dense over nodes for simplicity of the generator
	for k := range c {
		c[k] = make([]complex128, nn)
	}
	g := make([]float64, p.turns)
	// 3-point interior rule (barycentric 2/3, 1/6, 1/6), weights area/3: exact for quadratics, avoids r = 0.
	bary := [3][3]float64{{2.0 / 3, 1.0 / 6, 1.0 / 6}, {1.0 / 6, 2.0 / 3, 1.0 / 6}, {1.0 / 6, 1.0 / 6, 2.0 / 3}}
	for j := 0; j < nz-1; j++ {
		for i := 0; i < nr-1; i++ {
			tris := [2][3][2]int{{{i, j}, {i + 1, j}, {i + 1, j + 1}}, {{i, j}, {i + 1, j + 1}, {i, j + 1}}}
			for _, tri := range tris {
				var rr, zz [3]float64
				var nodes [3]int
				for k, v := range tri {
					rr[k], zz[k] = float64(v[0])*hr, float64(v[1])*hz
					nodes[k] = id(v[0], v[1])
				}
				area2 := (rr[1]-rr[0])*(zz[2]-zz[0]) - (rr[2]-rr[0])*(zz[1]-zz[0])
				area := area2 / 2
				var br, bz [3]float64
				for k := 0; k < 3; k++ {
					k1, k2 := (k+1)%3, (k+2)%3
					br[k] = (zz[k1] - zz[k2]) / area2
					bz[k] = (rr[k2] - rr[k1]) / area2
				}
				rc, zc := (rr[0]+rr[1]+rr[2])/3, (zz[0]+zz[1]+zz[2])/3
				sigma, turn := p.sigmaAt(rc, zc)
				var ke [3][3]complex128
				var ce [3]float64
				for _, lam := range bary {
					r := lam[0]*rr[0] + lam[1]*rr[1] + lam[2]*rr[2]
					w := area / 3 * 2 * math.Pi * r
					for a := 0; a < 3; a++ {
						for b := 0; b < 3; b++ {
							st := nu * (bz[a]*bz[b] + (br[a]+lam[a]/r)*(br[b]+lam[b]/r))
							ke[a][b] += complex(st*w, omega*sigma*lam[a]*lam[b]*w)
						}
						ce[a] += sigma * lam[a] * area / 3
					}
					if turn >= 0 {
						g[turn] += sigma / (2 * math.Pi * r) * area / 3
					}
				}
				for a := 0; a < 3; a++ {
					if nodes[a] < 0 {
						continue
					}
					for b := 0; b <= a; b++ {
						if nodes[b] >= 0 {
							t.Add(nodes[a], nodes[b], ke[a][b])
						}
					}
					if turn >= 0 {
						c[turn][nodes[a]] += complex(ce[a], 0)
					}
				}
			}
		}
	}
	rhs := make([]complex128, n)
	for k := 0; k < p.turns; k++ {
		row := nn + k
		for i, v := range c[k] {
			if v != 0 {
				t.Add(row, i, -v)
			}
		}
		t.Add(row, row, complex(g[k], 0)/complex(0, omega))
		rhs[row] = p.iTurn / complex(0, omega)
	}
	a, _ := t.Compile()
	coords := make([][2]float64, n)
	for j := 1; j < nz-1; j++ {
		for i := 1; i < nr-1; i++ {
			coords[id(i, j)] = [2]float64{float64(i) * hr, float64(j) * hz}
		}
	}
	for k := 0; k < p.turns; k++ {
		coords[nn+k] = [2]float64{math.NaN(), math.NaN()}
	}
	return a, coords, rhs
}

// gridSide returns the grid side giving about n unknowns.
func gridSide(n int) int { return int(math.Sqrt(float64(n))) + 2 }

func newAxi(side, turns int) axiProblem {
	return axiProblem{nr: side, nz: side, R: 0.1, Z: 0.1, freq: 10e3, turns: turns, iTurn: 1000}
}
