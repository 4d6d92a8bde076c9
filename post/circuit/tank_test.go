package circuit

import (
	"errors"
	"fmt"
	"math"
	"math/rand"
	"testing"
)

// fixedCoil is a frequency-independent coil R + jωL.
func fixedCoil(r, l float64) ImpedanceFunc {
	return func(f float64) (complex128, error) {
		return complex(r, 2*math.Pi*f*l), nil
	}
}

// loadedCoil is an invented frequency-dependent load: the resistance grows as √f (skin effect in coil and
// workpiece) and the inductance falls from l0 to lInf around fc (field pushed out of the workpiece).
func loadedCoil(r0, fr, l0, lInf, fc float64) ImpedanceFunc {
	return func(f float64) (complex128, error) {
		r := r0 * math.Sqrt(f/fr)
		l := lInf + (l0-lInf)/(1+(f/fc)*(f/fc))
		return complex(r, 2*math.Pi*f*l), nil
	}
}

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// Series resonance of an ideal LC: f0 = 1/(2π√(LC)). Source: Alexander & Sadiku, Fundamentals of Electric
// Circuits, chapter "Frequency Response", series resonance ω0 = 1/√(LC) (from memory for the chapter title).
func TestSeriesIdealLC(t *testing.T) {
	cases := []struct {
		r, l, c, esr, guessFactor float64
	}{
		{0.01, 10e-6, 1e-6, 0, 1},
		{0.01, 10e-6, 1e-6, 0, 0.1}, // guess far below: L is frequency independent, so no matter
		{0.5, 2e-6, 50e-6, 0.002, 7},
		{2, 1e-3, 10e-6, 0, 1},
		{0.001, 0.3e-6, 4e-6, 0.0005, 1.3},
	}
	for i, tc := range cases {
		t.Run(fmt.Sprint(i), func(t *testing.T) {
			f0 := 1 / (2 * math.Pi * math.Sqrt(tc.l*tc.c))
			tank := Tank{Coil: fixedCoil(tc.r, tc.l), C: tc.c, ESR: tc.esr, Topology: Series}
			res, err := tank.Resonance(f0 * tc.guessFactor)
			if err != nil {
				t.Fatal(err)
			}
			if e := relErr(res.Frequency, f0); e > 1e-6 {
				t.Errorf("f = %.9g Hz, want %.9g Hz (rel err %.2g)", res.Frequency, f0, e)
			}
			if e := relErr(res.IdealFrequency, f0); e > 1e-6 {
				t.Errorf("IdealFrequency = %.9g, want %.9g", res.IdealFrequency, f0)
			}
			if e := relErr(real(res.InputZ), tc.r+tc.esr); e > 1e-9 {
				t.Errorf("series input resistance %g, want R+ESR = %g", real(res.InputZ), tc.r+tc.esr)
			}
			if res.Evaluations > 6 {
				t.Errorf("%d impedance evaluations for a frequency-independent coil", res.Evaluations)
			}
		})
	}
}

// Parallel tank, coil R + jωL across C: the zero-phase frequency is f0·√(1 − R²C/L) (derived in the doc of
// ResonanceWithin from Im{Y} = 0; the same result is in e.g. Hayt & Kemmerly, Engineering Circuit Analysis,
// "other resonant forms" (from memory)). With ESR R2 in the capacitor branch:
// f = f0·√((L/C − R²)/(L/C − R2²)). At the zero-phase point Re{Z_in} = L/(CR) exactly for an ideal C.
func TestParallelZeroPhase(t *testing.T) {
	cases := []struct {
		name         string
		r, l, c, esr float64
	}{
		{"high Q", 0.02, 5e-6, 2e-6, 0},
		{"Q about 1.4 (R²C/L = 0.5)", math.Sqrt(0.5 * 5e-6 / 2e-6), 5e-6, 2e-6, 0},
		{"R²C/L = 0.9", math.Sqrt(0.9 * 1e-3 / 1e-6), 1e-3, 1e-6, 0},
		{"with ESR", 0.3, 5e-6, 2e-6, 0.1},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			f0 := 1 / (2 * math.Pi * math.Sqrt(tc.l*tc.c))
			lc := tc.l / tc.c
			want := f0 * math.Sqrt((lc-tc.r*tc.r)/(lc-tc.esr*tc.esr))
			tank := Tank{Coil: fixedCoil(tc.r, tc.l), C: tc.c, ESR: tc.esr, Topology: Parallel}
			res, err := tank.Resonance(f0)
			if err != nil {
				t.Fatal(err)
			}
			if e := relErr(res.Frequency, want); e > 1e-6 {
				t.Errorf("f = %.9g Hz, want %.9g Hz (rel err %.2g)", res.Frequency, want, e)
			}
			if tc.esr == 0 {
				rd := tc.l / (tc.c * tc.r)
				if e := relErr(real(res.InputZ), rd); e > 1e-5 {
					t.Errorf("dynamic resistance %g Ω, want L/(CR) = %g Ω", real(res.InputZ), rd)
				}
			}
			if math.Abs(imag(res.InputZ)) > 1e-5*real(res.InputZ) {
				t.Errorf("input impedance %v is not real at resonance", res.InputZ)
			}
		})
	}
}

func TestParallelNoZeroPhase(t *testing.T) {
	// R²C/L = 2: the admittance never becomes real at a positive frequency.
	tank := Tank{Coil: fixedCoil(math.Sqrt(2*1e-3/1e-6), 1e-3), C: 1e-6, Topology: Parallel}
	_, err := tank.Resonance(5e3)
	if !errors.Is(err, ErrNoResonance) {
		t.Fatalf("err = %v, want ErrNoResonance", err)
	}
}

// With a frequency-dependent coil the found frequency must make the tank reactance (coil taken at the same
// frequency) change sign within ±0.1 %.
func TestFrequencyDependentLoad(t *testing.T) {
	coils := []struct {
		name string
		z    ImpedanceFunc
	}{
		{"gentle", loadedCoil(0.02, 10e3, 3e-6, 2.2e-6, 8e3)},
		{"steep L drop near resonance", loadedCoil(0.05, 10e3, 6e-6, 1.5e-6, 30e3)},
		{"low Q (about 1)", loadedCoil(0.3, 10e3, 6e-6, 4e-6, 20e3)},
	}
	for _, top := range []Topology{Series, Parallel} {
		for _, coil := range coils {
			for _, c := range []float64{1e-6, 20e-6} {
				name := fmt.Sprintf("%s/%s/C=%g", top, coil.name, c)
				t.Run(name, func(t *testing.T) {
					tank := Tank{Coil: coil.z, C: c, ESR: 1e-3, Topology: top}
					res, err := tank.Resonance(10e3)
					if err != nil {
						t.Fatal(err)
					}
					if res.Evaluations > 12 {
						t.Errorf("%d impedance evaluations, want ≤ 12", res.Evaluations)
					}
					xl, err := tank.Reactance(res.Frequency * (1 - 1e-3))
					if err != nil {
						t.Fatal(err)
					}
					xh, err := tank.Reactance(res.Frequency * (1 + 1e-3))
					if err != nil {
						t.Fatal(err)
					}
					if (xl < 0) == (xh < 0) {
						t.Errorf("reactance does not cross zero around %g Hz: X(-0.1%%) = %g, X(+0.1%%) = %g",
							res.Frequency, xl, xh)
					}
					// The relative tolerance 1e-6: the reactance ±1e-6 away must also straddle zero
					// (a slightly looser 3e-6 allows for the interval's half-width rounding).
					xl, _ = tank.Reactance(res.Frequency * (1 - 3e-6))
					xh, _ = tank.Reactance(res.Frequency * (1 + 3e-6))
					if (xl < 0) == (xh < 0) {
						t.Errorf("resonance %g Hz is not within 3e-6 of the root", res.Frequency)
					}
				})
			}
		}
	}
}

// Property: for random fixed coils the found series frequency matches f0 and the parallel one its closed form.
// A pathological load, coil Q ≈ 0.15 with R ∝ √f: the closed-form first estimate is far off (the parallel
// formula has no root at the guess), so the geometric expansion does the work. It must still converge, at a
// higher cost.
func TestVeryLowQParallel(t *testing.T) {
	tank := Tank{Coil: loadedCoil(0.8, 10e3, 6e-6, 4e-6, 20e3), C: 20e-6, ESR: 1e-3, Topology: Parallel}
	res, err := tank.Resonance(10e3)
	if err != nil {
		t.Fatal(err)
	}
	xl, _ := tank.Reactance(res.Frequency * (1 - 1e-3))
	xh, _ := tank.Reactance(res.Frequency * (1 + 1e-3))
	if (xl < 0) == (xh < 0) {
		t.Errorf("no sign change around %g Hz", res.Frequency)
	}
	if res.Evaluations > 20 {
		t.Errorf("%d evaluations", res.Evaluations)
	}
}

func TestResonanceRandomProperty(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	for i := 0; i < 200; i++ {
		l := math.Pow(10, -7+4*rng.Float64())  // 0.1 µH .. 1 mH
		c := math.Pow(10, -8+4*rng.Float64())  // 10 nF .. 100 µF
		q := math.Pow(10, 0.3+2*rng.Float64()) // coil Q 2 .. 200
		f0 := 1 / (2 * math.Pi * math.Sqrt(l*c))
		r := 2 * math.Pi * f0 * l / q
		guess := f0 * math.Pow(10, rng.Float64()-0.5)
		for _, top := range []Topology{Series, Parallel} {
			want := f0
			if top == Parallel {
				want = f0 * math.Sqrt(1-r*r*c/l)
			}
			tank := Tank{Coil: fixedCoil(r, l), C: c, Topology: top}
			res, err := tank.Resonance(guess)
			if err != nil {
				t.Fatalf("case %d %s: %v", i, top, err)
			}
			if e := relErr(res.Frequency, want); e > 1e-6 {
				t.Errorf("case %d %s: f = %.9g, want %.9g (rel err %.2g)", i, top, res.Frequency, want, e)
			}
			if res.Evaluations > 8 {
				t.Errorf("case %d %s: %d evaluations", i, top, res.Evaluations)
			}
		}
	}
}

func TestResonanceErrors(t *testing.T) {
	boom := errors.New("solver exploded")
	failing := func(f float64) (complex128, error) { return 0, boom }
	capacitive := func(f float64) (complex128, error) { return complex(1, -1), nil }
	later := func() ImpedanceFunc { // fails on the second call
		n := 0
		return func(f float64) (complex128, error) {
			n++
			if n > 1 {
				return 0, boom
			}
			return complex(0.01, 2*math.Pi*f*1e-6), nil
		}
	}
	nan := func(f float64) (complex128, error) { return complex(math.NaN(), 1), nil }
	cases := []struct {
		name  string
		tank  Tank
		guess float64
		is    error
	}{
		{"zero C", Tank{Coil: fixedCoil(1, 1e-6), C: 0}, 1e3, nil},
		{"negative ESR", Tank{Coil: fixedCoil(1, 1e-6), C: 1e-6, ESR: -1}, 1e3, nil},
		{"bad topology", Tank{Coil: fixedCoil(1, 1e-6), C: 1e-6, Topology: 7}, 1e3, nil},
		{"zero guess", Tank{Coil: fixedCoil(1, 1e-6), C: 1e-6}, 0, nil},
		{"solver error", Tank{Coil: failing, C: 1e-6}, 1e3, boom},
		{"solver error later", Tank{Coil: later(), C: 1e-6}, 1e3, boom},
		{"capacitive coil", Tank{Coil: capacitive, C: 1e-6}, 1e3, nil},
		{"NaN impedance", Tank{Coil: nan, C: 1e-6}, 1e3, nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := tc.tank.Resonance(tc.guess)
			if err == nil {
				t.Fatal("no error")
			}
			if tc.is != nil && !errors.Is(err, tc.is) {
				t.Errorf("err = %v, does not wrap %v", err, tc.is)
			}
		})
	}
}

func TestNilCoilPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("no panic for a nil Coil")
		}
	}()
	Tank{C: 1e-6}.Resonance(1e3)
}

func TestResonanceShift(t *testing.T) {
	// Cold steel: more inductance; hot (above Curie, μr = 1): less. Series f ∝ 1/√L.
	cold := fixedCoil(0.08, 12e-6)
	hot := fixedCoil(0.04, 9e-6)
	sh, err := ResonanceShift(Tank{C: 5e-6, Topology: Series}, cold, hot, 20e3)
	if err != nil {
		t.Fatal(err)
	}
	want := math.Sqrt(12.0/9.0) - 1
	if math.Abs(sh.Relative-want) > 2e-6 {
		t.Errorf("relative shift %g, want %g", sh.Relative, want)
	}
	if e := relErr(sh.Delta, sh.Hot.Frequency-sh.Cold.Frequency); e > 1e-12 {
		t.Errorf("Delta inconsistent")
	}
}

// BenchmarkResonance reports the cost of the search itself (the impedance is cheap here) and the number of
// impedance evaluations per search as a custom metric.
func BenchmarkResonance(b *testing.B) {
	for _, tol := range []float64{1e-3, 1e-6, 1e-9} {
		for _, top := range []Topology{Series, Parallel} {
			b.Run(fmt.Sprintf("%s/tol=%g", top, tol), func(b *testing.B) {
				tank := Tank{Coil: loadedCoil(0.05, 10e3, 6e-6, 1.5e-6, 30e3), C: 4e-6, ESR: 1e-3, Topology: top}
				b.ReportAllocs()
				evals := 0
				for i := 0; i < b.N; i++ {
					res, err := tank.ResonanceWithin(10e3, tol)
					if err != nil {
						b.Fatal(err)
					}
					evals += res.Evaluations
				}
				b.ReportMetric(float64(evals)/float64(b.N), "solves/op")
			})
		}
	}
}
