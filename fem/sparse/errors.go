package sparse

import (
	"fmt"
	"math"
	"math/cmplx"
)

// SingularError reports a pivot that is zero, tiny relative to its column of A, or not finite. Column is the
// index in the caller's (unpermuted) numbering.
type SingularError struct {
	Column int
	Pivot  complex128
}

func (e *SingularError) Error() string {
	return fmt.Sprintf("sparse: matrix is singular or nearly so: pivot %v at row/column %d; likely causes: an unknown "+
		"with no coupling to the rest (a floating region, an isolated node, a row left empty), or a zero coefficient "+
		"where a source or constraint should act (missing material data, a circuit row with zero conductance)", e.Pivot, e.Column)
}

// NonFiniteError reports a NaN or infinite value in the input.
type NonFiniteError struct {
	Row, Column int // caller's numbering; Column is −1 for a right-hand side entry
	Value       complex128
}

func (e *NonFiniteError) Error() string {
	if e.Column < 0 {
		return fmt.Sprintf("sparse: right-hand side row %d is not finite (%v); check the source data feeding that row", e.Row, e.Value)
	}
	return fmt.Sprintf("sparse: matrix entry (%d, %d) is not finite (%v); likely cause: a NaN or Inf in material "+
		"data, a division by zero radius, or an uninitialised coefficient in row %d", e.Row, e.Column, e.Value, e.Row)
}

// AccuracyError reports a solve whose scaled residual stayed above the acceptance threshold after refinement.
type AccuracyError struct {
	Residual  float64
	Threshold float64
}

func (e *AccuracyError) Error() string {
	return fmt.Sprintf("sparse: solution inaccurate: scaled residual %.3g above %.3g after iterative refinement; "+
		"the matrix is nearly singular or badly scaled (e.g. a weakly coupled region or extreme material contrast)", e.Residual, e.Threshold)
}

func finite(v complex128) bool {
	return !math.IsNaN(real(v)) && !math.IsNaN(imag(v)) && !math.IsInf(real(v), 0) && !math.IsInf(imag(v), 0)
}

func cabs(v complex128) float64 { return cmplx.Abs(v) }
