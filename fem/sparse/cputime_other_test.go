//go:build !unix

package sparse

import "time"

// processCPU is not measured on this system.
func processCPU() time.Duration { return 0 }
