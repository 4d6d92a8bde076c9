package study

import (
	"fmt"
	"math"
	"math/cmplx"

	"eddyrz/fem"
	"eddyrz/geometry"
	"eddyrz/post"
)

// Solution is one solved job: the model, the raw field (at the drive the job file asks for, or at 1 A for a
// power-driven coil), and the designer's quantities at the job's drive level.
type Solution struct {
	Model  *Model
	Field  *fem.Solution
	Result *post.Result
	// Scale is the factor from Field's sources to Result's: 1, or the current (A rms per A) a power-driven coil
	// needs to put the wanted power into its part.
	Scale complex128
}

// Solve lays out, meshes and solves job and derives its quantities.
func Solve(job *geometry.Job) (*Solution, error) {
	md, err := Build(job)
	if err != nil {
		return nil, err
	}
	return md.Solve()
}

// Solve solves the model's field problem at the job's frequency and derives its quantities. Its symbolic
// analysis is kept for the model's later solvers (a tank study's, say).
func (md *Model) Solve() (*Solution, error) {
	sw, err := md.NewSweeper()
	if err != nil {
		return nil, err
	}
	return sw.SolveAt(md.Problem.Frequency)
}

// analyze derives the quantities of a solved field and applies a power drive's scale.
func (md *Model) analyze(sol *fem.Solution) (*Solution, error) {
	return md.analyzeWith(sol, post.Options{MeshTime: md.MeshTime})
}

// check refuses a result that holds a non-finite number where a design figure is expected.
func (s *Solution) check() error {
	bad := func(what string, x float64) error {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return fmt.Errorf("%s came out as %g: the solve cannot be trusted (check the job's materials and drive)", what, x)
		}
		return nil
	}
	for _, c := range s.Result.Coils {
		if cmplx.IsNaN(c.Current) || cmplx.IsInf(c.Current) || cmplx.IsNaN(c.Voltage) || cmplx.IsInf(c.Voltage) {
			return fmt.Errorf("coil %q: current or voltage is not finite: the solve cannot be trusted", c.Name)
		}
	}
	for _, p := range s.Result.Parts {
		if err := bad(fmt.Sprintf("power in part %q", p.Name), p.Power); err != nil {
			return err
		}
		if err := bad(fmt.Sprintf("force on part %q", p.Name), p.ForceZ); err != nil {
			return err
		}
	}
	return nil
}

// Report is the solve's report, with a note on how a power-driven coil's current was found.
func (s *Solution) Report() *post.Report {
	rep := s.Result.Report()
	if i := s.Model.PowerDrive; i >= 0 {
		c := s.Model.Job.Coils[i]
		rep.Notes = append(rep.Notes, fmt.Sprintf("coil %q is driven to put %.4g W into part %q: solved at 1 A rms and "+
			"scaled (the field is linear in the current), which needs %.4g A rms", c.Name, c.Value, c.Into, cmplx.Abs(s.Scale)))
	}
	return rep
}
