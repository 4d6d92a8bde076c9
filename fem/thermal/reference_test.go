package thermal

import (
	"math"
	"testing"

	"eddyrz/mesh"
)

// besselJ1Roots returns the first n positive roots of J1, by bisection between sign changes of math.J1.
func besselJ1Roots(n int) []float64 {
	var roots []float64
	step := 0.1
	x := 1.0 // J1 has no positive root below 3.83
	for len(roots) < n {
		a, b := x, x+step
		if math.J1(a)*math.J1(b) < 0 {
			for k := 0; k < 100; k++ {
				m := 0.5 * (a + b)
				if math.J1(a)*math.J1(m) <= 0 {
					b = m
				} else {
					a = m
				}
			}
			roots = append(roots, 0.5*(a+b))
		}
		x += step
	}
	return roots
}

// fluxCylinderRise is the temperature rise of a long solid cylinder of radius a, initially uniform, with a constant
// heat flux F into its surface (Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed. 1959, ch. VII, the infinite
// cylinder with constant flux at the surface; section number and formula from memory, checked in
// TestFluxCylinderSeriesSelfCheck):
//
//	T − T0 = (F a/k) [2κt/a² + r²/(2a²) − 1/4 − 2 Σ exp(−κ α_n² t/a²) J0(r α_n/a) / (α_n² J0(α_n))],  J1(α_n) = 0.
func fluxCylinderRise(F, a, k, kappa, r, t float64, alphas []float64) float64 {
	sum := 0.0
	for _, al := range alphas {
		sum += math.Exp(-kappa*al*al*t/(a*a)) * math.J0(r*al/a) / (al * al * math.J0(al))
	}
	return F * a / k * (2*kappa*t/(a*a) + r*r/(2*a*a) - 0.25 - 2*sum)
}

// The series must vanish at t = 0 (the initial condition), have the mean rise 2Ft/(ρca) the energy balance asks
// for, and carry the flux F at r = a: checks on the recalled formula, independent of the solver.
func TestFluxCylinderSeriesSelfCheck(t *testing.T) {
	alphas := besselJ1Roots(4000)
	const F, a, k, kappa = 1e5, 0.02, 40.0, 1e-5
	for _, r := range []float64{0, 0.005, 0.01, 0.015} {
		if d := fluxCylinderRise(F, a, k, kappa, r, 0, alphas); math.Abs(d) > 1e-3*F*a/k {
			t.Errorf("t = 0, r = %g: rise %g K, want 0", r, d)
		}
	}
	// Mean over the disc, by the midpoint rule in r with weight 2r/a².
	tt := 3.0
	mean, n := 0.0, 2000
	for i := 0; i < n; i++ {
		r := a * (float64(i) + 0.5) / float64(n)
		mean += fluxCylinderRise(F, a, k, kappa, r, tt, alphas[:200]) * 2 * r / (a * a) * a / float64(n)
	}
	want := 2 * F * tt * kappa / (k * a) // 2Ft/(ρca) with ρc = k/κ
	if relErr(mean, want) > 1e-4 {
		t.Errorf("mean rise %g K, want %g K", mean, want)
	}
	hr := 1e-7
	grad := (fluxCylinderRise(F, a, k, kappa, a, tt, alphas[:200]) - fluxCylinderRise(F, a, k, kappa, a-hr, tt, alphas[:200])) / hr
	if relErr(k*grad, F) > 1e-3 {
		t.Errorf("surface flux k∂T/∂r = %g W/m², want %g", k*grad, F)
	}
}

// Test 3a: transient radial conduction against the series solution, within 1 % of the rise.
func TestFluxCylinderTransient(t *testing.T) {
	const (
		a     = 0.02  // m
		F     = 1e5   // W/m² into the surface
		T0    = 300.0 // K
		k     = 40.0  // W/(m·K); invented steel-like material
		rho   = 7850.0
		cp    = 460.0
		dt    = 0.005 // s
		nr    = 80
		slice = 0.001 // m, height of the 1D slice (insulated ends)
	)
	kappa := k / (rho * cp)
	m := rectMesh(0, a, 0, slice, nr, 1, 1)
	bnd := edgesWhere(m, func(p, q mesh.Point) bool { return p.X == a && q.X == a },
		func(i, j int32) BoundaryEdge { return BoundaryEdge{A: i, B: j, Flux: F} })
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: Constant{K: k, Rho: rho, Cp: cp}}, Boundary: bnd}, T0)
	alphas := besselJ1Roots(200)
	checks := []float64{1, 3, 10, 30}
	step, worst := 0, 0.0
	for _, tc := range checks {
		for ; float64(step)*dt < tc-1e-9; step++ {
			mustStep(t, s, dt, nil)
		}
		surf := fluxCylinderRise(F, a, k, kappa, a, tc, alphas)
		for _, r := range []float64{0, 0.005, 0.01, 0.015, 0.02} {
			want := fluxCylinderRise(F, a, k, kappa, r, tc, alphas)
			got, ok := s.Probe(r, slice/2)
			if !ok {
				t.Fatalf("probe (%g, %g) outside", r, slice/2)
			}
			got -= T0
			// 1 % of the local rise where it is significant, else 1 % of the surface rise.
			tol := 0.01 * math.Max(math.Abs(want), 0.1*surf)
			worst = math.Max(worst, math.Abs(got-want)/tol)
			if math.Abs(got-want) > tol {
				t.Errorf("t = %g s, r = %g m: rise %.4f K, series %.4f K", tc, r, got, want)
			}
		}
	}
	t.Logf("largest deviation: %.2f of the 1 %% tolerance", worst)
	if e := s.EnergyBalanceError(); e > 1e-6 {
		t.Errorf("energy balance error %g", e)
	}
	if e := s.Energy(); relErr(e.FluxIn, F*2*math.Pi*a*slice*30) > 1e-9 {
		t.Errorf("flux in %g J, want %g J", e.FluxIn, F*2*math.Pi*a*slice*30)
	}
}

// Test 3d: steady state with uniform generation and a convective surface: T_s = T_amb + q a/(2h) and
// T(r) = T_s + q (a² − r²)/(4k) (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, §3.5.2, radial
// systems with generation; section from memory).
func TestSteadyGeneration(t *testing.T) {
	const a, q, k, h, Ta = 0.02, 1e7, 30.0, 500.0, 300.0
	for _, nr := range []int{10, 40} {
		m := rectMesh(0, a, 0, 0.002, nr, 2, 1)
		bnd := edgesWhere(m, func(p, q mesh.Point) bool { return p.X == a && q.X == a },
			func(i, j int32) BoundaryEdge { return BoundaryEdge{A: i, B: j, HeatTransfer: h, Ambient: Ta} })
		s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: Constant{K: k, Rho: 8000, Cp: 500}}, Boundary: bnd}, Ta)
		src := uniformSource(m, q)
		for i := 0; i < 2; i++ {
			mustStep(t, s, 1e9, src) // one backward-Euler step this long is the steady state
		}
		Ts := Ta + q*a/(2*h)
		center := q * a * a / (4 * k)
		tol := 2.0 / float64(nr*nr) // O(h²) relative to the centre rise; 0.5 % at 20 elements
		for _, r := range []float64{0, 0.005, 0.01, 0.015, 0.02} {
			want := Ts + q*(a*a-r*r)/(4*k)
			got, _ := s.Probe(r, 0.001)
			if math.Abs(got-want) > tol*center {
				t.Errorf("nr = %d, r = %g: T = %.5f K, want %.5f K", nr, r, got, want)
			}
		}
		// Global balance in the steady state: all generated heat leaves by convection (a statement about the
		// discrete solution, exact to the Newton tolerance).
		if e := s.EnergyBalanceError(); e > 1e-8 {
			t.Errorf("nr = %d: energy balance error %g", nr, e)
		}
	}
}

// Test 3e (steady): conductivity linear in T, k = k0 (1 + β (T − T1)), with generation and a convective surface.
// The Kirchhoff transform U = ∫ k/k0 dT turns the problem into the constant-k one (Carslaw & Jaeger 1959, §1.7,
// from memory), so U(T(r)) − U(T_s) = q (a² − r²)/(4 k0) with T_s = T_amb + q a/(2h) from the global balance.
func TestKirchhoffSteady(t *testing.T) {
	const a, q, k0, beta, T1, h, Ta = 0.02, 2e7, 20.0, 2e-3, 300.0, 800.0, 300.0
	m := rectMesh(0, a, 0, 0.001, 60, 1, 1)
	bnd := edgesWhere(m, func(p, q mesh.Point) bool { return p.X == a && q.X == a },
		func(i, j int32) BoundaryEdge { return BoundaryEdge{A: i, B: j, HeatTransfer: h, Ambient: Ta} })
	mat := Funcs{
		K:   func(T float64) float64 { return k0 * (1 + beta*(T-T1)) },
		Rho: func(float64) float64 { return 7000 },
		Cp:  func(float64) float64 { return 500 },
	}
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: mat}, Boundary: bnd}, Ta)
	src := uniformSource(m, q)
	for i := 0; i < 3; i++ {
		mustStep(t, s, 1e9, src)
	}
	Ts := Ta + q*a/(2*h)
	u := func(T float64) float64 { return (T - T1) + beta/2*(T-T1)*(T-T1) }
	worst := 0.0
	for _, r := range []float64{0, 0.004, 0.008, 0.012, 0.016, 0.02} {
		target := u(Ts) + q*(a*a-r*r)/(4*k0)
		want := T1 + (-1+math.Sqrt(1+2*beta*target))/beta // solves u(T) = target
		got, _ := s.Probe(r, 0.0005)
		worst = math.Max(worst, math.Abs(got-want))
		// Constant k = k0 would give a centre rise of q a²/(4k0) = 100 K over T_s; the nonlinear one is ~20 %
		// lower, so 0.2 K separates them clearly.
		if math.Abs(got-want) > 0.2 {
			t.Errorf("r = %g: T = %.4f K, Kirchhoff %.4f K", r, got, want)
		}
	}
	t.Logf("largest deviation from the Kirchhoff solution: %.3g K", worst)
}

// Test 3e (transient): backward Euler is first order in time: with a temperature-dependent conductivity and
// heat capacity the differences between solutions at dt, dt/2, dt/4 must shrink by about 2 each halving.
func TestTimeConvergenceOrder(t *testing.T) {
	m := rectMesh(0, 0.01, 0, 0.01, 8, 8, 1)
	bnd := edgesWhere(m, allEdges, func(i, j int32) BoundaryEdge {
		return BoundaryEdge{A: i, B: j, HeatTransfer: 50, Ambient: 300, Emissivity: 0.6}
	})
	mat := Funcs{
		K:   func(T float64) float64 { return 50 / (1 + 1e-3*(T-300)) },
		Rho: func(float64) float64 { return 7800 },
		Cp:  func(T float64) float64 { return 450 + 0.3*(T-300) },
	}
	src := make([]float64, len(m.Tris))
	for i, tri := range m.Tris {
		if m.Nodes[tri[0]].X > 0.008 {
			src[i] = 5e8
		}
	}
	run := func(dt float64) float64 {
		s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: mat}, Boundary: bnd}, 300)
		for i := 0; i < int(math.Round(2/dt)); i++ {
			mustStep(t, s, dt, src)
		}
		T, _ := s.Probe(0, 0.005)
		return T
	}
	t1, t2, t4 := run(0.2), run(0.1), run(0.05)
	ratio := (t1 - t2) / (t2 - t4)
	t.Logf("centre T: %.6f %.6f %.6f K, ratio %.3f", t1, t2, t4, ratio)
	if math.Abs(ratio-2) > 0.25 {
		t.Errorf("convergence ratio %.3f, want ≈ 2 (first order)", ratio)
	}
}

// Test 3c: a nearly isothermal body (conductivity 1e7 W/(m·K), so the internal drop is ~1e-4 K) cooling by radiation alone follows the lumped
// Stefan–Boltzmann law ρcV dT/dt = −εσA (T⁴ − T_s⁴), whose closed form is
// F(T) = [ln((T − T_s)/(T + T_s)) − 2 arctan(T/T_s)] / (4 T_s³), F(T(t)) = F(T0) − εσA t/(ρcV)
// (integral of 1/(T⁴ − T_s⁴); Incropera & DeWitt, §5.3, radiation-only lumped capacitance, from memory).
func TestRadiationLumped(t *testing.T) {
	const a, hgt, eps, Ts, T0 = 0.01, 0.02, 0.8, 300.0, 1200.0
	const rho, cp = 8000.0, 500.0
	m := rectMesh(0, a, 0, hgt, 6, 12, 1)
	bnd := edgesWhere(m, allEdges, func(i, j int32) BoundaryEdge {
		return BoundaryEdge{A: i, B: j, Emissivity: eps, Ambient: Ts}
	})
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: Constant{K: 1e7, Rho: rho, Cp: cp}}, Boundary: bnd}, T0)
	area := 2*math.Pi*a*hgt + 2*math.Pi*a*a
	vol := math.Pi * a * a * hgt
	if relErr(s.Volume(), vol) > 1e-12 {
		t.Fatalf("volume %g m³, want %g", s.Volume(), vol)
	}

	// Instantaneous loss of a short step: the law itself, at the end-of-step temperature.
	dt0 := 1e-4
	mustStep(t, s, dt0, nil)
	T := s.Hottest().T
	want := area * eps * StefanBoltzmann * (math.Pow(T, 4) - math.Pow(Ts, 4)) * dt0
	if got := s.Energy().Radiation; relErr(got, want) > 1e-6 {
		t.Errorf("radiated %g J in %g s, Stefan–Boltzmann %g J", got, dt0, want)
	}

	F := func(T float64) float64 { return (math.Log((T-Ts)/(T+Ts)) - 2*math.Atan(T/Ts)) / (4 * Ts * Ts * Ts) }
	rate := eps * StefanBoltzmann * area / (rho * cp * vol)
	dt := 0.25
	for step := 0; step < 400; step++ {
		mustStep(t, s, dt, nil)
	}
	tt := s.Time()
	// Solve F(T) = F(T0) − rate·t by bisection.
	lo, hi := Ts+1e-9, T0
	target := F(T0) - rate*tt
	for k := 0; k < 200; k++ {
		mid := 0.5 * (lo + hi)
		if F(mid) < target {
			lo = mid
		} else {
			hi = mid
		}
	}
	exact := 0.5 * (lo + hi)
	hot, cold := s.Hottest().T, s.Coldest().T
	t.Logf("t = %g s: body %.4f..%.4f K, lumped law %.4f K", tt, cold, hot, exact)
	if math.Abs(hot-exact) > 0.01*(T0-exact) || math.Abs(cold-exact) > 0.01*(T0-exact) {
		t.Errorf("t = %g s: body %.3f..%.3f K, lumped law %.3f K (1 %% of the drop)", tt, cold, hot, exact)
	}
	if e := s.EnergyBalanceError(); e > 1e-8 {
		t.Errorf("energy balance error %g", e)
	}
}

// Test 3d on a quality triangulation of two layers with different conductivities (nodes on r = r_c belong to both
// materials): with uniform generation the radial flux is q r/2 in either layer, so integrating the radial equation
// of Incropera & DeWitt §3.5.2 (section from memory) layer by layer gives
// T = T_s + q (a² − r²)/(4 k_out) for r ≥ r_c and T = T(r_c) + q (r_c² − r²)/(4 k_in) for r ≤ r_c,
// with T_s = T_amb + q a/(2h); top and bottom are insulated.
func TestSteadyCompositeUnstructured(t *testing.T) {
	const a, rc, hgt, q, kIn, kOut, h, Ta = 0.02, 0.012, 0.01, 5e6, 15.0, 60.0, 400.0, 300.0
	g := mesh.PSLG{
		Points: []mesh.Point{{X: 0, Y: 0}, {X: rc, Y: 0}, {X: a, Y: 0}, {X: a, Y: hgt}, {X: rc, Y: hgt}, {X: 0, Y: hgt}},
		Segments: []mesh.Segment{{A: 0, B: 1, Tag: 4}, {A: 1, B: 2, Tag: 4}, {A: 2, B: 3, Tag: 3}, {A: 3, B: 4, Tag: 4},
			{A: 4, B: 5, Tag: 4}, {A: 5, B: 0, Tag: 1}, {A: 1, B: 4, Tag: 0}},
		Regions: []mesh.RegionSeed{{P: mesh.Point{X: rc / 2, Y: hgt / 2}, Tag: 1}, {P: mesh.Point{X: (a + rc) / 2, Y: hgt / 2}, Tag: 2}},
	}
	m, err := mesh.Triangulate(g, mesh.Options{MaxArea: 0.5e-3 * 0.5e-3})
	if err != nil {
		t.Fatal(err)
	}
	var bnd []BoundaryEdge
	for _, e := range m.Edges {
		if e.Tag == 3 {
			bnd = append(bnd, BoundaryEdge{A: e.A, B: e.B, HeatTransfer: h, Ambient: Ta})
		}
	}
	mats := map[int32]Material{1: Constant{K: kIn, Rho: 7000, Cp: 500}, 2: Constant{K: kOut, Rho: 8900, Cp: 390}}
	s := mustSolver(t, Model{Mesh: m, Materials: mats, Boundary: bnd}, Ta)
	src := uniformSource(m, q)
	for i := 0; i < 2; i++ {
		mustStep(t, s, 1e9, src)
	}
	Ts := Ta + q*a/(2*h)
	Tc := Ts + q*(a*a-rc*rc)/(4*kOut)
	exact := func(r float64) float64 {
		if r >= rc {
			return Ts + q*(a*a-r*r)/(4*kOut)
		}
		return Tc + q*(rc*rc-r*r)/(4*kIn)
	}
	rise := exact(0) - Ts
	worst := 0.0
	for _, r := range []float64{0, 0.003, 0.006, 0.009, 0.012, 0.015, 0.018, 0.02} {
		for _, z := range []float64{0, 0.0037, hgt} {
			got, ok := s.Probe(r, z)
			if !ok {
				t.Fatalf("probe (%g, %g) outside", r, z)
			}
			worst = math.Max(worst, math.Abs(got-exact(r))/rise)
		}
	}
	t.Logf("%d nodes; largest deviation %.2g of the %.2f K centre rise", len(m.Nodes), worst, rise)
	if worst > 0.005 {
		t.Errorf("largest deviation %.3g of the centre rise, want ≤ 0.5 %%", worst)
	}
	if e := s.EnergyBalanceError(); e > 1e-8 {
		t.Errorf("energy balance error %g", e)
	}
}
