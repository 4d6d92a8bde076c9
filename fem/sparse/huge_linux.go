//go:build linux

package sparse

import (
	"syscall"
	"unsafe"
)

// adviseHuge asks the kernel to back a large, not yet touched buffer with transparent huge pages. On machines
// where huge pages are "madvise"-only this cuts the page faults of filling L by a factor of ~500, which measured
// as a large share of the factorisation time. Failure is harmless and ignored.
func adviseHuge(x []complex128) {
	const page = 4096
	if len(x)*16 < 8<<20 {
		return
	}
	b := unsafe.Slice((*byte)(unsafe.Pointer(&x[0])), len(x)*16)
	off := int((page - uintptr(unsafe.Pointer(&b[0]))%page) % page)
	b = b[off:]
	b = b[:len(b)&^(page-1)]
	_ = syscall.Madvise(b, 14) // MADV_HUGEPAGE
}
