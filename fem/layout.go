package fem

import (
	"fmt"
	"math"

	"eddyrz/geometry"
	"eddyrz/mesh"
)

// Mesh triangulates a job's layout with the layout's size field and minimum angle, quadratic when the layout
// asks for order 2.
func Mesh(job *geometry.Job, lay *geometry.Layout) (*mesh.Mesh, error) {
	m, err := mesh.Triangulate(lay.PSLG, mesh.Options{Size: lay.Size, MinAngle: lay.MinAngle})
	if err != nil {
		return nil, fmt.Errorf("meshing %s: %w", job.File, err)
	}
	m.SortLocal() // neighbours in the plane near in memory: the assembly and field passes gather less widely
	if lay.Order == 2 {
		m.MakeQuadratic()
	}
	return m, nil
}

// FromLayout returns the harmonic problem of a job on m, a mesh of its layout (see Mesh), at the job's
// frequency, with a Robin outer boundary on the layout's far semicircle.
//
// Materials are evaluated at each region's temperature: σ = 1/ρ(T), μr(T). A stranded block's DC resistance is
// Rdc = N² ρ 2π r̄ /(F A), with r̄ its centroid radius and A its meshed area (uniform current in a fraction F
// of the area, N series turns). A power-driven coil becomes a 1 A current drive: the fields are linear in the
// current, so the caller scales the solution by √(P_wanted / P_at_1A).
func FromLayout(job *geometry.Job, lay *geometry.Layout, m *mesh.Mesh) (*Problem, error) {
	p := &Problem{
		Mesh: m, Frequency: job.Frequency, AppliedBz: complex(job.AppliedB, 0),
		Outer: OuterBoundary{Robin: true, CenterZ: lay.Outer.CenterZ, Radius: lay.Outer.Radius},
	}
	for _, c := range job.Coils {
		fc := Coil{Name: c.Name, Drive: CurrentDrive, Value: complex(c.Value, 0)}
		switch c.Drive {
		case geometry.DriveVoltage:
			fc.Drive = VoltageDrive
		case geometry.DrivePower:
			fc.Value = 1
		}
		p.Coils = append(p.Coils, fc)
	}
	// Centroid radius and area of every tag, from the mesh.
	area := map[int32]float64{}
	rArea := map[int32]float64{}
	for t, tri := range m.Tris {
		a := m.Area(t)
		rc := (m.Nodes[tri[0]].X + m.Nodes[tri[1]].X + m.Nodes[tri[2]].X) / 3
		area[m.Tags[t]] += a
		rArea[m.Tags[t]] += a * rc
	}
	for _, r := range lay.Regions {
		fr := Region{Tag: r.Tag, Name: r.Name, Coil: -1, MuR: 1}
		if r.Material != nil {
			fr.MuR = r.Material.MuR(r.Temperature)
		}
		switch r.Kind {
		case geometry.AirRegion:
			fr.Kind = Air
		case geometry.PartRegion:
			fr.Kind = Part
			fr.Sigma = r.Material.Conductivity(r.Temperature)
		case geometry.TurnRegion:
			fr.Kind = SolidTurn
			fr.Sigma = r.Material.Conductivity(r.Temperature)
			fr.Coil, fr.Sense, fr.Strands = r.Coil, r.Sense, 1
		case geometry.StrandedRegion:
			fr.Kind = Stranded
			fr.Coil, fr.Sense, fr.Strands = r.Coil, r.Sense, r.Strands
			a := area[r.Tag]
			if !(a > 0) || !(r.Fill > 0) {
				return nil, fmt.Errorf("region %q: stranded block with area %g m² and fill %g", r.Name, a, r.Fill)
			}
			rbar := rArea[r.Tag] / a
			n := float64(r.Strands)
			fr.Rdc = n * n * r.Material.Resistivity(r.Temperature) * 2 * math.Pi * rbar / (r.Fill * a)
		default:
			return nil, fmt.Errorf("region %q: unknown kind %d", r.Name, r.Kind)
		}
		p.Regions = append(p.Regions, fr)
	}
	return p, nil
}
