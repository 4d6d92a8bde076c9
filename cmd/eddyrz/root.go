package main

import (
	"io"

	"github.com/spf13/cobra"
)

// version is the release of this build.
const version = "0.1.0"

func newRootCmd(stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:   "eddyrz",
		Short: "Axisymmetric eddy-current field solver for induction heating and levitation coils",
		Long: `eddyrz reads a job file describing a coil and its workpieces in the r-z half plane, meshes the
cross-section, solves the time-harmonic eddy-current field by the finite-element method and reports
power, impedance, forces, heating and stability.

Units: SI inside; the job file takes quantities with units ("12 mm", "60 kHz", "450 A").
Currents, voltages and fields are rms values unless a name says peak.

Exit status: 0 success; 1 runtime failure (I/O); 2 bad job file or command line;
3 numerical failure (singular or untrustworthy linear system).

Safety: induction equipment works at lethal voltages, causes RF burns, and molten metal meeting
cooling water explodes. eddyrz results are design estimates; build and operate equipment under
local electrical codes and licensed practice.`,
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error { return &flagError{err} })
	root.AddCommand(newVersionCmd(), newMeshCmd(stdout), newSolveCmd(stdout), newHeatCmd(stdout, stderr), newLevitateCmd(stdout), newSweepCmd(stdout))
	return root
}

func newVersionCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "version",
		Short: "Print the eddyrz version",
		Args:  cobra.NoArgs,
		RunE: func(c *cobra.Command, _ []string) error {
			c.Println("eddyrz", version)
			return nil
		},
	}
}
