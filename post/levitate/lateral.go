package levitate

import (
	"fmt"
	"math"
	"math/cmplx"

	"eddyrz/fem"
	"eddyrz/geometry"
)

// LateralAssumption states the model behind LateralEstimate, for the output.
const LateralAssumption = "ESTIMATE for a small body: the part is replaced by an equivalent sphere (same volume) " +
	"whose induced dipole m = αH responds to the coil's field alone (part removed, its own perturbation of the " +
	"field ignored) and whose time-averaged force derives from U = −(Re α/(2μ0))|B|² (B rms; the coil field's " +
	"phase taken as uniform). Near the axis div B = 0 and curl B = 0 give B_r ≈ −(r/2)B0', B_z ≈ B0 − (r²/4)B0'', " +
	"so |B|² ≈ |B0|² + r²(|B0'|²/4 − Re{B0* B0''}/2) and k_r = ∂²U/∂r² = (|Re α|/μ0)(|B0'|²/4 − Re{B0* B0''}/2): " +
	"laterally stable (k_r > 0) where |B| has a minimum across the axis. B0(z) = B_z(0, z) is fitted by a " +
	"quadratic over ± half the equivalent radius about the body's centre."

// LateralEstimate is the small-body lateral stability figure along the sweep (see LateralAssumption).
type LateralEstimate struct {
	Assumption string `json:"assumption"`
	// EquivalentRadius a of the sphere of the part's volume, m; Q = a/δ; ReAlpha = −(8πa³/3)G(q), m³
	// (reference/README.md §1).
	EquivalentRadius float64        `json:"equivalent_radius_m"`
	Q                float64        `json:"a_over_skin_depth"`
	ReAlpha          float64        `json:"re_alpha_m3"`
	Curve            []LateralPoint `json:"curve"`
}

// LateralPoint is the estimate with the part's reference height at Z (its centre of volume at CentreZ on the
// axis).
type LateralPoint struct {
	Z       float64 `json:"z_m"`
	CentreZ float64 `json:"centre_z_m"`
	// B0 is |B_z(0, z)| of the coil alone, T rms; B2Curvature the coefficient of r² in |B|², T²/m².
	B0          float64 `json:"b0_t_rms"`
	B2Curvature float64 `json:"b2_curvature_t2_per_m2"`
	// Kr is the lateral stiffness estimate, N/m (> 0 restoring); KzSmall and FzSmall the same model's axial
	// stiffness and force, N/m and N, to compare with the solved ones.
	Kr      float64 `json:"k_r_estimate_n_per_m"`
	KzSmall float64 `json:"k_z_small_body_n_per_m"`
	FzSmall float64 `json:"force_z_small_body_n"`
	Stable  bool    `json:"laterally_stable_estimate"`
}

// ForceFunctionG is G(q) = ¾[1 − (3/(2q))(sinh 2q − sin 2q)/(cosh 2q − cos 2q)] for a sphere of radius a, q = a/δ,
// with Re α = −(8πa³/3)G(q) (reference/README.md §1, derived from Landau & Lifshitz §59).
func ForceFunctionG(q float64) float64 {
	if !(q > 0) {
		panic(fmt.Sprintf("levitate: ForceFunctionG(%g): q must be positive", q))
	}
	if q < 0.1 {
		// Leading term of the closed form's series, G ≈ 2q⁴/105 [derived; against the closed form in 50-digit
		// arithmetic it is off by 2.5·10⁻⁷ at q = 0.05, so by ≲ 4·10⁻⁶ below 0.1], where the closed form loses
		// digits to cancellation.
		return 2 * q * q * q * q / 105
	}
	x := 2 * q
	if x > 40 {
		return 0.75 * (1 - 3/(2*q))
	}
	return 0.75 * (1 - 3/(2*q)*(math.Sinh(x)-math.Sin(x))/(math.Cosh(x)-math.Cos(x)))
}

// axisField samples B_z on the axis of a solution, scaled by k.
type axisField struct {
	sol *fem.Solution
	k   complex128
}

// fit returns B0, B0' and B0” at z by a least-squares quadratic over [z−w, z+w] (17 samples).
func (af axisField) fit(z, w float64) (b0, b1, b2 complex128, err error) {
	const n = 17
	var s [5]float64 // Σ t^k
	var rb [3]complex128
	for i := 0; i < n; i++ {
		t := w * (2*float64(i)/(n-1) - 1)
		v, ok := af.sol.At(0, z+t)
		if !ok {
			return 0, 0, 0, fmt.Errorf("axis point z = %.4g mm is outside the mesh", (z+t)*1e3)
		}
		bz := v.Bz * af.k
		p := 1.0
		for k := 0; k < 5; k++ {
			s[k] += p
			if k < 3 {
				rb[k] += bz * complex(p, 0)
			}
			p *= t
		}
	}
	// Normal equations M c = rb, M_ij = s[i+j]; symmetric samples make s1 = s3 = 0.
	c1 := rb[1] / complex(s[2], 0)
	det := s[0]*s[4] - s[2]*s[2]
	c0 := (rb[0]*complex(s[4], 0) - rb[2]*complex(s[2], 0)) / complex(det, 0)
	c2 := (rb[2]*complex(s[0], 0) - rb[0]*complex(s[2], 0)) / complex(det, 0)
	return c0, c1, 2 * c2, nil
}

// centreOffset is the height of the part's centre of volume above its reference height, m.
func centreOffset(p geometry.Part) float64 {
	switch p.Shape {
	case geometry.Sphere:
		return 0
	case geometry.Cylinder, geometry.TubePart:
		return p.Height / 2
	case geometry.Cup:
		ri := p.Radius - p.Wall
		vo := p.Radius * p.Radius * p.Height
		vi := ri * ri * (p.Height - p.Base)
		return (vo*p.Height/2 - vi*(p.Base+(p.Height-p.Base)/2)) / (vo - vi)
	}
	// Polygon: z̄ = ∫∫ r z / ∫∫ r, less its lowest point.
	var m0, m1 float64
	pts := p.Points
	zmin := math.Inf(1)
	for i := range pts {
		a, b := pts[i], pts[(i+1)%len(pts)]
		c := a.X*b.Y - b.X*a.Y
		m0 += c * (a.X + b.X) / 6
		m1 += c * (a.X*(2*a.Y+b.Y) + b.X*(a.Y+2*b.Y)) / 24
		zmin = math.Min(zmin, a.Y)
	}
	return m1/m0 - zmin
}

// lateralAt evaluates the estimate with the part's reference height at z.
func lateralAt(af axisField, reAlpha, a, off, z float64) (LateralPoint, error) {
	zc := z + off
	b0, b1, b2, err := af.fit(zc, a/2)
	if err != nil {
		return LateralPoint{}, err
	}
	c := -reAlpha / fem.Mu0 // |Re α|/μ0
	curv := sq(cmplx.Abs(b1))/4 - real(cmplx.Conj(b0)*b2)/2
	// |B0|² along z: d/dz = 2Re{B0* B0'}, d²/dz² = 2|B0'|² + 2Re{B0* B0''}.
	d1 := 2 * real(cmplx.Conj(b0)*b1)
	d2 := 2*sq(cmplx.Abs(b1)) + 2*real(cmplx.Conj(b0)*b2)
	return LateralPoint{Z: z, CentreZ: zc, B0: cmplx.Abs(b0), B2Curvature: curv, Kr: c * curv,
		KzSmall: c / 2 * d2, FzSmall: -c / 2 * d1, Stable: curv > 0}, nil
}

func sq(x float64) float64 { return x * x }
