package material

import (
	"math"
	"sort"
)

// Provenance marks used below (the same as the project's reference notes): [source] read in the cited work;
// [memory] recalled from the cited work, not re-checked against it; [common practice] a trade value with no
// single source; [derived] computed from other values here, the rule named.

func k(c float64) float64 { return c + 273.15 }

// e8 scales a table given in 10⁻⁸ Ω·m; e6 one in μΩ·m.
func e8(v ...float64) []float64 { return scale(1e-8, v) }
func e6(v ...float64) []float64 { return scale(1e-6, v) }
func scale(f float64, v []float64) []float64 {
	out := make([]float64, len(v))
	for i := range v {
		out[i] = f * v[i]
	}
	return out
}

// builtins builds the library afresh on each call, so callers may modify what they get.
func builtins() map[string]*Material {
	lib := map[string]*Material{}
	add := func(m *Material) { lib[m.Name] = m }

	add(&Material{
		Name:        "copper",
		Description: "copper, high-conductivity (coil tube and bar)",
		// Matula, J. Phys. Chem. Ref. Data 8 (1979) 1147, recommended values for pure copper [memory except
		// 350 K and 400 K, read via a transcription]; 1000 K and 1200 K are approximate (≈) in that note.
		ResistivitySolid: Table{
			T: []float64{273, 293, 300, 350, 400, 500, 600, 700, 800, 900, 1000, 1200},
			V: e8(1.543, 1.678, 1.725, 2.063, 2.402, 3.090, 3.792, 4.514, 5.262, 6.041, 6.86, 8.63),
		},
		ResistivityLiquid: 20.5e-8, // Matula 1979, liquid at the melting point 20-21·10⁻⁸ Ω·m [memory, ±5 %]
		MuRel:             1,
		DensitySolid:      8960, // CRC Handbook [memory, handbook-level]
		DensityLiquid:     8000, // liquid near the melting point [memory, handbook-level]
		// Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table A.1, pure copper [memory].
		SpecificHeatTable: Table{T: []float64{300, 400, 600, 800, 1000, 1200}, V: []float64{385, 397, 417, 433, 451, 480}},
		ThermalCondTable:  Table{T: []float64{300, 400, 600, 800, 1000, 1200}, V: []float64{401, 393, 379, 366, 352, 339}},
		EmissivityValue:   0.6,     // oxidised copper, Incropera Table A.11 range 0.5-0.8 [memory]
		Melting:           1357.77, // CRC Handbook, 1084.62 °C [memory]
		Latent:            209e3,   // CRC Handbook [memory, handbook-level]
	})

	// Desai, James & Ho, J. Phys. Chem. Ref. Data 13 (1984) 1131, pure aluminium [source for citation, values
	// memory]; the 933.47 K solid value ≈ 10.9 is from the same note [memory].
	alT := []float64{273, 293, 300, 400, 500, 600, 700, 800, 900, 933.47}
	alRho := []float64{2.417, 2.650, 2.733, 3.87, 4.99, 6.13, 7.35, 8.70, 10.18, 10.9}
	add(&Material{
		Name:              "aluminium",
		Description:       "aluminium, pure (99.99 %)",
		ResistivitySolid:  Table{T: alT, V: e8(alRho...)},
		ResistivityLiquid: 24.5e-8, // Desai et al. 1984, liquid at the melting point 24.2-24.8·10⁻⁸ Ω·m [memory]
		MuRel:             1,
		DensitySolid:      2700, // CRC Handbook [memory, handbook-level]
		DensityLiquid:     2375, // liquid at the melting point [memory, handbook-level]
		// 293 K: CRC Handbook 897 [memory]; 400-800 K: Incropera Table A.1, pure aluminium [memory].
		SpecificHeatTable: Table{T: []float64{293, 400, 600, 800}, V: []float64{897, 949, 1033, 1146}},
		ThermalCondTable:  Table{T: []float64{300, 400, 600, 800}, V: []float64{237, 240, 231, 218}}, // Incropera Table A.1 [memory]
		EmissivityValue:   0.15,                                                                      // lightly oxidised aluminium, Incropera Table A.11 range 0.1-0.2 [memory]
		Melting:           933.47,                                                                    // CRC Handbook, 660.32 °C [memory]
		Latent:            397e3,                                                                     // CRC Handbook [memory, handbook-level]
	})

	// A wrought 6xxx-type aluminium alloy, solid and liquid. Resistivity: 3.5·10⁷ S/m at 20 °C [common practice],
	// with the temperature rise of pure aluminium (Desai 1984, above) added on (Matthiessen's rule) [derived].
	alloyRho := make([]float64, 0, len(alT))
	alloyT := make([]float64, 0, len(alT))
	for i, t := range alT {
		if t < 293 || t > 900 {
			continue
		}
		alloyT = append(alloyT, t)
		alloyRho = append(alloyRho, 1/3.5e7+(alRho[i]-2.650)*1e-8)
	}
	add(&Material{
		Name:             "aluminium-alloy",
		Description:      "aluminium alloy, wrought 6xxx-type, solid and liquid",
		ResistivitySolid: Table{T: alloyT, V: alloyRho},
		// Pure liquid aluminium 24.5·10⁻⁸ (Desai 1984 [memory]) plus the alloy's residual 0.2·10⁻⁸ (Matthiessen's
		// rule) [derived, approximation].
		ResistivityLiquid: 24.7e-8,
		MuRel:             1,
		DensitySolid:      2700,                                                  // ASM Metals Handbook vol. 2, 6061 [memory]
		DensityLiquid:     2375,                                                  // taken equal to pure aluminium's liquid density [approximation]
		SpecificHeatTable: Const(896),                                            // ASM Metals Handbook vol. 2, 6061 [memory]
		ThermalCondTable:  Table{T: []float64{293, 700}, V: []float64{167, 180}}, // ASM vol. 2, 6061-T6 at 25 °C 167 [memory]; 180 near 430 °C [memory, ±10 %]
		EmissivityValue:   0.15,                                                  // as pure aluminium above [memory]
		Melting:           925,                                                   // liquidus of 6061, 652 °C, ASM vol. 2 [memory]
		Latent:            390e3,                                                 // close to pure aluminium's 397 kJ/kg [memory, handbook-level]
	})

	add(&Material{
		Name: "steel",
		Description: "medium-carbon steel (about 0.45 % C); below the Curie temperature μr is a linear effective " +
			"approximation of a field-dependent permeability",
		// ASM Metals Handbook vol. 1, physical properties of carbon and low-alloy steels, ~AISI 1045 row, in μΩ·m
		// [memory, ±5 %].
		ResistivitySolid: Table{
			T: []float64{k(20), k(100), k(200), k(400), k(600), k(800), k(1000), k(1200)},
			V: e6(0.16, 0.22, 0.30, 0.49, 0.76, 1.11, 1.15, 1.22),
		},
		ResistivityLiquid: 1.4e-6, // liquid steel [memory, approximate]
		// Effective linear μr at induction-heating field strengths: tens to about a hundred [common practice];
		// 50 is this library's choice. An approximation: the real μ depends on H and temperature.
		MuRel:         50,
		Curie:         k(770), // Curie temperature of iron, 770 °C [memory, textbook]
		DensitySolid:  7850,   // plain carbon steel [memory, handbook-level]
		DensityLiquid: 7000,   // liquid steel near its melting point [memory, approximate]
		// 460-490 at 20 °C and ≈ 600-650 above 800 °C [memory, handbook-level]: mid-range values; the apparent
		// peak near 750 °C (the magnetic and α→γ transformations) is not represented [approximation].
		SpecificHeatTable: Table{T: []float64{k(20), k(800)}, V: []float64{475, 625}},
		// ASM Metals Handbook vol. 1, plain carbon steel ~AISI 1042 [memory, ±10 %].
		ThermalCondTable: Table{
			T: []float64{k(100), k(200), k(400), k(600), k(800), k(1000), k(1200)},
			V: []float64{50.7, 48.1, 41.7, 33.9, 24.8, 26.8, 29.7},
		},
		EmissivityValue: 0.8,     // oxidised steel, Incropera Table A.11 [memory]
		Melting:         k(1495), // 1480-1520 °C [memory, handbook-level]: mid-range
		Latent:          260e3,   // 250-270 kJ/kg [memory, handbook-level]: mid-range
	})

	add(&Material{
		Name:        "stainless-steel",
		Description: "austenitic stainless steel (18 % Cr, 8 % Ni type), non-magnetic",
		// ASM Metals Handbook vol. 1, type 304 data sheet: 0.72 μΩ·m at 20 °C, 0.78 at 100 °C, 1.16 at 650 °C
		// [memory]; held constant above 650 °C (end of table) [approximation].
		ResistivitySolid:  Table{T: []float64{k(20), k(100), k(650)}, V: e6(0.72, 0.78, 1.16)},
		ResistivityLiquid: 1.3e-6, // [memory, approximate]
		MuRel:             1,
		DensitySolid:      8000,                                                          // ASM vol. 1, type 304 [memory]
		SpecificHeatTable: Const(500),                                                    // ASM vol. 1, type 304, 0-100 °C [memory]
		ThermalCondTable:  Table{T: []float64{k(100), k(500)}, V: []float64{16.2, 21.5}}, // ASM vol. 1, type 304 [memory]
		EmissivityValue:   0.6,                                                           // oxidised stainless steel, Incropera Table A.11 range 0.5-0.7 [memory]
		Melting:           k(1450),                                                       // liquidus of type 304 [memory]
		Latent:            270e3,                                                         // typical of iron-base alloys [memory, approximate]
	})

	add(&Material{
		Name:        "graphite",
		Description: "graphite, fine-grain isomolded (susceptors, crucibles); does not melt",
		// Isomolded grades span about 8-15 μΩ·m at room temperature [memory]; held constant (the mild fall with
		// temperature is ignored) [approximation].
		ResistivitySolid: Table{T: []float64{293.15}, V: []float64{10e-6}},
		MuRel:            1,
		DensitySolid:     1800, // typical isomolded grade [memory]
		// 710 at 300 K (CRC Handbook [memory]); ≈ 1600 at 1000 K [memory, ±10 %].
		SpecificHeatTable: Table{T: []float64{300, 1000}, V: []float64{710, 1600}},
		ThermalCondTable:  Const(100),  // grade-dependent, 80-130 W/(m·K) [memory]
		EmissivityValue:   0.85,        // Incropera Table A.11 [memory]
		Melting:           math.Inf(1), // sublimes near 3900 K at atmospheric pressure [memory]: no liquid phase
	})

	add(&Material{
		Name:        "brass",
		Description: "cartridge brass (70 % Cu, 30 % Zn)",
		// 28 % IACS, 6.2·10⁻⁸ Ω·m at 20 °C, ASM Metals Handbook vol. 2, C26000 [memory]; temperature dependence
		// not tabulated: held constant [approximation].
		ResistivitySolid: Table{T: []float64{k(20)}, V: []float64{6.2e-8}},
		// Between liquid copper (≈ 0.21 μΩ·m) and liquid zinc (≈ 0.37 μΩ·m) [memory]: rough estimate, ±30 %.
		ResistivityLiquid: 0.3e-6,
		MuRel:             1,
		DensitySolid:      8530,       // ASM vol. 2, C26000 [memory]
		SpecificHeatTable: Const(375), // ASM vol. 2, C26000 [memory]
		ThermalCondTable:  Const(120), // ASM vol. 2, C26000 [memory]
		EmissivityValue:   0.3,        // oxidised brass, Incropera Table A.11 range 0.2-0.6 [memory]
		Melting:           k(955),     // liquidus of C26000 [memory]
		Latent:            170e3,      // [memory, rough]
	})

	add(&Material{
		Name:        "titanium",
		Description: "titanium, commercially pure",
		// 0.42 μΩ·m at 20 °C, CRC Handbook, pure titanium [memory]; temperature dependence not tabulated: held
		// constant [approximation].
		ResistivitySolid:  Table{T: []float64{k(20)}, V: []float64{0.42e-6}},
		ResistivityLiquid: 1.7e-6, // [memory, ±20 %]
		MuRel:             1,
		DensitySolid:      4507,        // CRC Handbook [memory]
		SpecificHeatTable: Const(523),  // CRC Handbook [memory]
		ThermalCondTable:  Const(21.9), // Incropera Table A.1 at 300 K [memory]
		EmissivityValue:   0.3,         // oxidised titanium [memory, rough]
		Melting:           1941,        // CRC Handbook, 1668 °C [memory]
		Latent:            295e3,       // 14.15 kJ/mol (CRC Handbook [memory]) / 0.04787 kg/mol [derived]
	})

	add(&Material{
		Name:        "zinc-alloy",
		Description: "zinc die-casting alloy (Zn, 4 % Al; ASTM AG40A)",
		// 27 % IACS, 6.4·10⁻⁸ Ω·m at 20 °C, ASM Metals Handbook vol. 2 [memory]; held constant [approximation].
		ResistivitySolid: Table{T: []float64{k(20)}, V: []float64{6.4e-8}},
		// Pure liquid zinc near its melting point ≈ 0.37 μΩ·m [memory], taken for the alloy [approximation].
		ResistivityLiquid: 0.37e-6,
		MuRel:             1,
		DensitySolid:      6600,       // ASM vol. 2 [memory]
		SpecificHeatTable: Const(419), // ASM vol. 2 [memory]
		ThermalCondTable:  Const(113), // ASM vol. 2 [memory]
		EmissivityValue:   0.25,       // [memory, rough]
		Melting:           k(387),     // liquidus, 381-387 °C melting range, ASM vol. 2 [memory]
		Latent:            112e3,      // pure zinc, CRC Handbook [memory], taken for the alloy [approximation]
	})
	return lib
}

// Builtin returns a fresh copy of the built-in material called name, or false.
func Builtin(name string) (*Material, bool) {
	m, ok := builtins()[name]
	return m, ok
}

// Names lists the built-in materials, sorted.
func Names() []string {
	lib := builtins()
	names := make([]string, 0, len(lib))
	for n := range lib {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}
