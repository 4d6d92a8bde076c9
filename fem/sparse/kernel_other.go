//go:build !amd64

package sparse

const hasAVX2FMA = false

func gemv4(d, a0, a1, a2, a3 []complex128, w []complex128) { gemv4Go(d, a0, a1, a2, a3, w) }
