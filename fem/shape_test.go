package fem

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestShapeNodalAndPartitionOfUnity(t *testing.T) {
	nodes := [][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}, {.5, .5, 0}, {0, .5, .5}, {.5, 0, .5}}
	for _, o := range []Order{1, 2} {
		nl := o.NumNodes()
		n := make([]float64, nl)
		for k := range nl {
			o.Shape(nodes[k], n)
			for i := range nl {
				want := 0.0
				if i == k {
					want = 1
				}
				if math.Abs(n[i]-want) > 1e-14 {
					t.Errorf("order %d: N_%d at node %d = %g, want %g", o, i, k, n[i], want)
				}
			}
		}
		rng := rand.New(rand.NewPCG(1, 2))
		for range 50 {
			a, b := rng.Float64(), rng.Float64()
			if a+b > 1 {
				a, b = 1-a, 1-b
			}
			o.Shape([3]float64{1 - a - b, a, b}, n)
			var s float64
			for _, v := range n {
				s += v
			}
			if math.Abs(s-1) > 1e-14 {
				t.Errorf("order %d: Σ N = %g at (%g, %g)", o, s, a, b)
			}
		}
	}
}

// Gradients against central differences on a skewed triangle.
func TestShapeGradFiniteDifference(t *testing.T) {
	p := [3][2]float64{{0.3, 0.1}, {0.9, 0.25}, {0.45, 0.8}}
	area, gl := triGeom(p)
	if area <= 0 {
		t.Fatal("test triangle not counter-clockwise")
	}
	bary := func(r, z float64) [3]float64 {
		var l [3]float64
		for k := range 3 {
			i := (k + 1) % 3
			l[k] = gl[k][0]*(r-p[i][0]) + gl[k][1]*(z-p[i][1])
		}
		return l
	}
	for _, o := range []Order{1, 2} {
		nl := o.NumNodes()
		n1, n2 := make([]float64, nl), make([]float64, nl)
		dr, dz := make([]float64, nl), make([]float64, nl)
		r, z := 0.55, 0.4
		o.ShapeGrad(bary(r, z), gl, dr, dz)
		const h = 1e-6
		o.Shape(bary(r+h, z), n1)
		o.Shape(bary(r-h, z), n2)
		for i := range nl {
			if fd := (n1[i] - n2[i]) / (2 * h); math.Abs(fd-dr[i]) > 1e-7 {
				t.Errorf("order %d: dN_%d/dr = %g, finite difference %g", o, i, dr[i], fd)
			}
		}
		o.Shape(bary(r, z+h), n1)
		o.Shape(bary(r, z-h), n2)
		for i := range nl {
			if fd := (n1[i] - n2[i]) / (2 * h); math.Abs(fd-dz[i]) > 1e-7 {
				t.Errorf("order %d: dN_%d/dz = %g, finite difference %g", o, i, dz[i], fd)
			}
		}
	}
}

// ∫ x^a y^b over the reference triangle = a! b! / (a+b+2)! (standard result, e.g. Zienkiewicz & Taylor,
// The Finite Element Method vol. 1, area-coordinate integration formula).
func TestQuadratureExactness(t *testing.T) {
	fact := func(n int) float64 {
		f := 1.0
		for k := 2; k <= n; k++ {
			f *= float64(k)
		}
		return f
	}
	rules := DefaultRules()
	for name, q := range map[string]QuadRule{"interior": rules.Interior, "axis": rules.Axis} {
		var ws float64
		for g, l := range q.L {
			ws += q.W[g]
			for k := range 3 {
				if l[k] <= 0 {
					t.Errorf("%s: point %d on the boundary: %v", name, g, l)
				}
			}
		}
		if math.Abs(ws-1) > 1e-14 {
			t.Errorf("%s: weights sum to %g", name, ws)
		}
		for deg := 0; deg <= 5; deg++ {
			for a := 0; a <= deg; a++ {
				b := deg - a
				var s float64
				for g, l := range q.L {
					s += q.W[g] * 0.5 * math.Pow(l[1], float64(a)) * math.Pow(l[2], float64(b))
				}
				want := fact(a) * fact(b) / fact(a+b+2)
				if math.Abs(s-want) > 1e-14 {
					t.Errorf("%s: ∫x^%d y^%d = %.16g, want %.16g", name, a, b, s, want)
				}
			}
		}
		// Degree 6 must not be exact for radon7 (a check that the test can fail).
		if name == "interior" {
			var s float64
			for g, l := range q.L {
				s += q.W[g] * 0.5 * math.Pow(l[1], 6)
			}
			if math.Abs(s-fact(6)/fact(8)) < 1e-12 {
				t.Errorf("radon7 integrates x^6 exactly; the rule is not the one documented")
			}
		}
	}
}
