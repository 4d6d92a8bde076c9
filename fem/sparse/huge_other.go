//go:build !linux

package sparse

func adviseHuge([]complex128) {}
