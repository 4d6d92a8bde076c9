package hardware

import (
	"errors"
	"fmt"
	"math"

	"eddyrz/geometry"
	"eddyrz/post/cooling"
)

// CoolingStudy is the water cooling of the job's coil at its operating loss.
type CoolingStudy struct {
	Circuit cooling.Circuit
	Result  cooling.Result
	// LossBasis says which operating point the loss comes from.
	LossBasis string
	// Bore describes how the bore diameter was found (round tube, or hydraulic diameter of a hollow bar).
	Bore  string
	Notes []string
}

// CoilWaterPath returns the bore diameter (m) and the water path length (m) of a coil of hollow turns: the
// bore of a round tube is its diameter less twice its wall; a hollow rectangular bar's is the hydraulic diameter
// 4A/P = 2ab/(a+b) of its a × b bore (the usual stand-in for a non-circular duct in friction and heat-transfer
// correlations, e.g. Incropera & DeWitt §8.8, from memory); the path is the helix length Σ 2π r over the turns
// (the pitch adds a negligible (pitch/2πr)²/2). When the turns differ, the smallest bore is returned (the
// highest pressure drop). It fails for a solid or stranded turn, which carries no water.
func CoilWaterPath(c geometry.Coil) (bore, length float64, how string, err error) {
	if len(c.Turns) == 0 {
		return 0, 0, "", fmt.Errorf("coil %q has no turns", c.Name)
	}
	bore = math.Inf(1)
	kinds := map[string]bool{}
	for i, t := range c.Turns {
		var d float64
		switch t.Kind {
		case geometry.TubeSection:
			d = t.Diameter - 2*t.Wall
			kinds["round tube bore"] = true
		case geometry.BarSection:
			a, b := t.Width-2*t.Wall, t.Height-2*t.Wall
			d = 2 * a * b / (a + b)
			kinds["hydraulic diameter 2ab/(a+b) of the rectangular bore"] = true
		default:
			return 0, 0, "", fmt.Errorf("coil %q turn %d is a stranded block: it carries no cooling water", c.Name, i+1)
		}
		if t.Wall <= 0 || !(d > 0) {
			return 0, 0, "", fmt.Errorf("coil %q turn %d is solid (no wall given): it carries no cooling water", c.Name, i+1)
		}
		bore = math.Min(bore, d)
		length += 2 * math.Pi * t.R
	}
	for k := range kinds {
		if how != "" {
			how += " and "
		}
		how += k
	}
	return bore, length, how, nil
}

// StudyCooling sizes the water of the job's single coil for a coil loss of loss watts (the coil's own Joule loss
// at the operating point), with the job's [cooling] section. The minor losses of bends, fittings and hoses are
// not included (not in the job file); the pressure drop is the straight-tube friction of the helix.
func StudyCooling(job *geometry.Job, loss float64, lossBasis string) (*CoolingStudy, error) {
	cj := job.Cooling
	if cj == nil {
		return nil, errors.New("cooling: the job has no [cooling] section")
	}
	if len(job.Coils) != 1 {
		return nil, fmt.Errorf("cooling: the job has %d coils; the cooling analysis handles exactly one", len(job.Coils))
	}
	bore, length, how, err := CoilWaterPath(job.Coils[0])
	if err != nil {
		return nil, fmt.Errorf("cooling: %w", err)
	}
	cs := &CoolingStudy{LossBasis: lossBasis, Bore: how}
	cs.Circuit = cooling.Circuit{
		Loss: loss, BoreDiameter: bore, PathLength: length, Circuits: cj.Circuits,
		InletTemperature: cj.Inlet, TemperatureRise: cj.Rise, SupplyPressure: cj.Pressure, Roughness: cj.Roughness,
	}
	if cs.Result, err = cs.Circuit.Solve(); err != nil {
		return nil, err
	}
	cs.Notes = append(cs.Notes, "pressure drop: straight-tube friction over the helix only; bends, fittings and hoses add to it")
	if job.Coils[0].Turns[0].Kind == geometry.BarSection {
		cs.Notes = append(cs.Notes, "rectangular bore modelled as a round bore of its hydraulic diameter: velocity and wall heat flux come out 4/π high for a square bore (pressure drop on the safe side; the wall estimate moves little, as h rises with the velocity)")
	}
	return cs, nil
}
