// Command eddyrz designs induction heating and levitation coils from a plain-text job file: it meshes the r-z
// cross-section, solves the time-harmonic eddy-current field and reports power, impedance, forces and heating.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/spf13/cobra"

	"eddyrz/fem/sparse"
	"eddyrz/geometry"
)

// Exit codes, documented in the root command's help.
const (
	exitOK        = 0
	exitFailure   = 1 // runtime failure: I/O, an unexpected error
	exitInput     = 2 // the job file or the command line is wrong
	exitNumerical = 3 // the linear system is singular or the solution cannot be trusted
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

// run executes the command line args and returns the process exit status.
func run(args []string, stdout, stderr io.Writer) int {
	root := newRootCmd(stdout, stderr)
	root.SetArgs(args)
	err := root.Execute()
	if err == nil {
		return exitOK
	}
	// A job-file mistake prints as its own line, file:line: key: what is wrong (how to fix).
	var in *geometry.InputError
	if errors.As(err, &in) {
		fmt.Fprintln(stderr, in.Error())
	} else {
		fmt.Fprintln(stderr, "eddyrz:", err)
	}
	return exitCode(err)
}

// exitCode maps an error to the documented exit status.
func exitCode(err error) int {
	var in *geometry.InputError
	var fl *flagError
	var sing *sparse.SingularError
	switch {
	case errors.As(err, &in), errors.As(err, &fl), strings.HasPrefix(err.Error(), "unknown command"):
		return exitInput
	case errors.As(err, &sing):
		return exitNumerical
	default:
		return exitFailure
	}
}

// exactArgs is cobra.ExactArgs with the error marked as a usage error.
func exactArgs(n int) cobra.PositionalArgs {
	return func(c *cobra.Command, args []string) error {
		if err := cobra.ExactArgs(n)(c, args); err != nil {
			return &flagError{fmt.Errorf("%w (see %s --help)", err, c.CommandPath())}
		}
		return nil
	}
}

// flagError is a command-line usage error (exit status 2).
type flagError struct{ err error }

func (e *flagError) Error() string { return e.err.Error() }
func (e *flagError) Unwrap() error { return e.err }
