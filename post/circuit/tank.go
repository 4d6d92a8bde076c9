// Package circuit sizes the resonant tank around a loaded work coil: it finds the tank's self-consistent resonant
// frequency (the coil impedance is re-evaluated, i.e. a field solve is run, at every trial frequency), and at
// resonance it derives the coil and capacitor duty, the matching transformer and the inverter current for a target
// workpiece power.
//
// Conventions: SI units; phasors are RMS (x(t) = √2 Re{X e^{jωt}}), so every current and voltage here is an rms
// value and complex power is S = V I*. Impedances are Z = R + jX with X > 0 inductive.
//
// The package depends on no other eddyrz package: the field solver hands in the coil impedance as an
// ImpedanceFunc.
package circuit

import (
	"errors"
	"fmt"
	"math"
)

// ImpedanceFunc returns the impedance Z (Ω) seen at the coil terminals at frequency f (Hz), with the workpiece in
// place. Each call normally costs one field solve. An error (bad frequency, failed solve) is passed up wrapped.
type ImpedanceFunc func(f float64) (complex128, error)

// Topology is the way the capacitor bank is connected to the coil.
type Topology int

const (
	// Series: the capacitor bank is in series with the coil; the tank is driven by a voltage source
	// and presents, at resonance, roughly the coil resistance.
	Series Topology = iota
	// Parallel: the capacitor bank is across the coil terminals; the tank is driven by a current
	// source (or through a choke) and presents, at resonance, the dynamic resistance ≈ L/(C R).
	Parallel
)

// String returns "series" or "parallel".
func (t Topology) String() string {
	switch t {
	case Series:
		return "series"
	case Parallel:
		return "parallel"
	}
	return fmt.Sprintf("Topology(%d)", int(t))
}

// DefaultRelTol is the relative tolerance on the resonant frequency used by Tank.Resonance.
const DefaultRelTol = 1e-6

// StartFactor is the ratio of the suggested start-up frequency of a self-oscillating or phase-locked drive to the
// tank's resonant frequency: the drive starts above resonance, where the tank looks inductive to the bridge, and
// falls to resonance. 1.15 is common practice (10-20 % above resonance is usual), not a derived value.
const StartFactor = 1.15

// ErrNoResonance is returned (wrapped) when the tank reactance does not change sign in the searched range.
var ErrNoResonance = errors.New("circuit: no resonance found")

// Tank is a work coil with a capacitor bank.
type Tank struct {
	Coil     ImpedanceFunc // coil impedance with the load in place; must not be nil
	C        float64       // capacitance of the bank, F; must be > 0
	ESR      float64       // equivalent series resistance of the bank, Ω; 0 for an ideal capacitor
	Topology Topology      // series or parallel connection
}

// capZ returns the capacitor branch impedance ESR + 1/(jωC), Ω.
func (t Tank) capZ(f float64) complex128 {
	w := 2 * math.Pi * f
	return complex(t.ESR, -1/(w*t.C))
}

// inputZ combines a coil impedance zc (taken at f) with the capacitor bank into the tank's input impedance, Ω.
func (t Tank) inputZ(f float64, zc complex128) complex128 {
	zcap := t.capZ(f)
	if t.Topology == Parallel {
		return zc * zcap / (zc + zcap)
	}
	return zc + zcap
}

// InputImpedance returns the impedance (Ω) the tank presents at its terminals at frequency f (Hz): the coil in
// series with the bank, or the coil in parallel with the bank. It calls t.Coil once.
func (t Tank) InputImpedance(f float64) (complex128, error) {
	zc, err := t.coilAt(f)
	if err != nil {
		return 0, err
	}
	return t.inputZ(f, zc), nil
}

// Reactance returns Im{Z_in(f)} (Ω), the quantity whose zero defines resonance (see Resonance).
func (t Tank) Reactance(f float64) (float64, error) {
	z, err := t.InputImpedance(f)
	return imag(z), err
}

func (t Tank) coilAt(f float64) (complex128, error) {
	if t.Coil == nil {
		panic("circuit: Tank.Coil is nil")
	}
	if !(f > 0) || math.IsInf(f, 0) {
		return 0, fmt.Errorf("circuit: frequency %g Hz is not positive and finite", f)
	}
	z, err := t.Coil(f)
	if err != nil {
		return 0, fmt.Errorf("circuit: coil impedance at %g Hz: %w", f, err)
	}
	if math.IsNaN(real(z)) || math.IsNaN(imag(z)) || math.IsInf(real(z), 0) || math.IsInf(imag(z), 0) {
		return 0, fmt.Errorf("circuit: coil impedance at %g Hz is not finite: %v", f, z)
	}
	return z, nil
}

func (t Tank) validate() error {
	if !(t.C > 0) || math.IsInf(t.C, 0) {
		return fmt.Errorf("circuit: capacitance %g F must be positive and finite", t.C)
	}
	if t.ESR < 0 || math.IsNaN(t.ESR) {
		return fmt.Errorf("circuit: capacitor ESR %g Ω must not be negative", t.ESR)
	}
	if t.Topology != Series && t.Topology != Parallel {
		return fmt.Errorf("circuit: unknown topology %d", int(t.Topology))
	}
	return nil
}

// modelFrequency is the closed-form resonant frequency (Hz) of the tank if the coil were the fixed R + jωL it
// shows at f. Series: f0 = 1/(2π√(LC)) (the ESR shifts no reactance). Parallel, with R1 the coil resistance and
// R2 the ESR, the zero of Im{Y}: ω² = (1/(LC))·(L/C − R1²)/(L/C − R2²) (derivation in Resonance's doc); when
// that has no real root the ideal f0 is returned and the bracket search decides.
func (t Tank) modelFrequency(f float64, zc complex128) float64 {
	w := 2 * math.Pi * f
	l := imag(zc) / w
	f0 := 1 / (2 * math.Pi * math.Sqrt(l*t.C))
	if t.Topology == Parallel {
		num := l/t.C - real(zc)*real(zc)
		den := l/t.C - t.ESR*t.ESR
		if num > 0 && den > 0 {
			return f0 * math.Sqrt(num/den)
		}
	}
	return f0
}

// Resonance is the self-consistent resonant operating frequency of a tank.
type Resonance struct {
	Topology       Topology
	Frequency      float64    // Hz, where Im{Z_in} = 0 with the coil impedance taken at this same frequency
	CoilZ          complex128 // Ω, coil impedance at Frequency
	InputZ         complex128 // Ω, tank input impedance at Frequency (real to within the tolerance)
	IdealFrequency float64    // Hz, 1/(2π√(LC)) with L = Im{CoilZ}/ω at Frequency, for comparison
	Evaluations    int        // number of ImpedanceFunc calls (field solves) the search used
}

// Resonance finds the tank's resonant frequency to DefaultRelTol, starting near fGuess (Hz); see ResonanceWithin.
func (t Tank) Resonance(fGuess float64) (Resonance, error) {
	return t.ResonanceWithin(fGuess, DefaultRelTol)
}

// ResonanceWithin finds the frequency f at which the tank's input impedance is real, Im{Z_in(f)} = 0, with the
// coil impedance evaluated at f itself (the load changes with frequency), to a relative tolerance relTol on f.
//
// Which zero: for both topologies this is the zero-phase, unity-power-factor frequency, the one a self-oscillating
// or phase-locked drive settles at. For a series tank it is exactly where ωL = 1/(ωC). For a parallel tank it
// is not: with the coil R + jωL across an ideal C, Im{Y} = ωC − ωL/(R² + ω²L²) = 0 gives
// ω² = 1/(LC) − R²/L², i.e. f = f0 √(1 − R²C/L) with f0 = 1/(2π√(LC)); with the ESR R2 in the capacitor branch,
// ω² = (1/(LC))(L/C − R²)/(L/C − R2²). The difference from ωL·ωC = 1 is about 1/(2Q²) relative, negligible for the
// Q ≈ 5-50 of induction coils but not for a very low-Q load; a parallel tank with R²C/L ≥ 1 has no zero-phase
// frequency at all and ErrNoResonance is returned. (The frequency of maximum |Z_in| is a third, different point.)
//
// Search: L at fGuess gives a closed-form estimate f1 (the formulas above); the coil is re-evaluated at f1, which
// gives a second estimate f2 and the direction of the root from the sign of the reactance; a bracket around f1
// is expanded geometrically (step doubled each time) until the reactance changes sign, then Brent's method
// (inverse quadratic interpolation safeguarded by bisection) closes it. The tests see 3-5 evaluations for a
// frequency-independent coil and 6-11 for strongly frequency-dependent loads; a coil with Q well below 1 in a
// parallel tank can take more (up to about 15), because the first closed-form estimate is then poor.
func (t Tank) ResonanceWithin(fGuess, relTol float64) (Resonance, error) {
	if err := t.validate(); err != nil {
		return Resonance{}, err
	}
	if !(relTol > 0 && relTol < 0.1) {
		return Resonance{}, fmt.Errorf("circuit: relative tolerance %g must lie in (0, 0.1)", relTol)
	}
	ev := &counter{tank: t}
	z0, err := ev.coil(fGuess)
	if err != nil {
		return Resonance{}, err
	}
	if imag(z0) <= 0 {
		return Resonance{}, fmt.Errorf("circuit: coil is not inductive at %g Hz (Z = %v)", fGuess, z0)
	}
	fa := t.modelFrequency(fGuess, z0)
	xa, zca, err := ev.reactance(fa)
	if err != nil {
		return ev.fail(err)
	}
	if xa == 0 {
		return ev.result(fa, zca), nil
	}
	// Below resonance a series tank is capacitive and a parallel tank inductive.
	up := (t.Topology == Series) == (xa < 0)
	step := relTol
	if imag(zca) > 0 {
		f2 := t.modelFrequency(fa, zca)
		step = math.Max(2*math.Abs(f2-fa)/fa, relTol)
	}
	step = math.Min(step, 0.5)
	const maxExpand = 40
	for k := 0; k < maxExpand; k++ {
		fb := fa * (1 + step)
		if !up {
			fb = fa / (1 + step)
		}
		xb, zcb, err := ev.reactance(fb)
		if err != nil {
			return ev.fail(err)
		}
		if xb == 0 {
			return ev.result(fb, zcb), nil
		}
		if (xa < 0) != (xb < 0) {
			f, err := brent(ev.reactanceOnly, fa, fb, xa, xb, relTol)
			if err != nil {
				return ev.fail(err)
			}
			zc, err := ev.coil(f)
			if err != nil {
				return ev.fail(err)
			}
			return ev.result(f, zc), nil
		}
		fa, xa = fb, xb
		step *= 2
		if fa > 1e3*fGuess || fa < 1e-3*fGuess {
			break
		}
	}
	return ev.fail(fmt.Errorf("%w: %s tank reactance keeps its sign from %g Hz to %g Hz",
		ErrNoResonance, t.Topology, fGuess, fa))
}

// counter evaluates the coil through the tank and counts the calls. Evaluated points are remembered so that
// returning a point Brent's method already visited costs no extra solve.
type counter struct {
	tank Tank
	n    int
	seen map[float64]complex128
}

func (c *counter) coil(f float64) (complex128, error) {
	if z, ok := c.seen[f]; ok {
		return z, nil
	}
	z, err := c.tank.coilAt(f)
	c.n++
	if err != nil {
		return 0, err
	}
	if c.seen == nil {
		c.seen = make(map[float64]complex128)
	}
	c.seen[f] = z
	return z, nil
}

func (c *counter) reactance(f float64) (float64, complex128, error) {
	zc, err := c.coil(f)
	if err != nil {
		return 0, 0, err
	}
	return imag(c.tank.inputZ(f, zc)), zc, nil
}

func (c *counter) reactanceOnly(f float64) (float64, error) {
	x, _, err := c.reactance(f)
	return x, err
}

func (c *counter) result(f float64, zc complex128) Resonance {
	w := 2 * math.Pi * f
	l := imag(zc) / w
	return Resonance{
		Topology:       c.tank.Topology,
		Frequency:      f,
		CoilZ:          zc,
		InputZ:         c.tank.inputZ(f, zc),
		IdealFrequency: 1 / (2 * math.Pi * math.Sqrt(l*c.tank.C)),
		Evaluations:    c.n,
	}
}

func (c *counter) fail(err error) (Resonance, error) {
	return Resonance{Topology: c.tank.Topology, Evaluations: c.n}, err
}

// brent returns a zero of g inside the bracket [a, b] (g(a) = fa and g(b) = fb of opposite signs) to within
// relTol·|x| (Brent, Algorithms for Minimization without Derivatives, 1973, ch. 4: secant / inverse quadratic
// interpolation, falling back to bisection whenever the interpolated step is not safely inside the bracket).
func brent(g func(float64) (float64, error), a, b, fa, fb, relTol float64) (float64, error) {
	c, fc := a, fa
	d := b - a
	e := d
	for iter := 0; iter < 200; iter++ {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 2*math.SmallestNonzeroFloat64 + 0.5*relTol*math.Abs(b)
		m := 0.5 * (c - b)
		if math.Abs(m) <= tol || fb == 0 {
			return b, nil
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			s := fb / fa
			if a == c {
				p = 2 * m * s
				q = 1 - s
			} else {
				qq := fa / fc
				r := fb / fc
				p = s * (2*m*qq*(qq-r) - (b-a)*(r-1))
				q = (qq - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < math.Min(3*m*q-math.Abs(tol*q), math.Abs(e*q)) {
				e = d
				d = p / q
			} else {
				d = m
				e = d
			}
		} else {
			d = m
			e = d
		}
		a, fa = b, fb
		if math.Abs(d) > tol {
			b += d
		} else {
			b += math.Copysign(tol, m)
		}
		var err error
		fb, err = g(b)
		if err != nil {
			return 0, err
		}
	}
	return 0, fmt.Errorf("%w: Brent iteration did not converge", ErrNoResonance)
}
