// Package sparse stores and solves sparse complex symmetric linear systems (A = Aᵀ, never conjugated): compressed
// storage, fill-reducing orderings, a supernodal LDLᵀ factorisation with a reusable symbolic analysis, solves with
// iterative refinement and a residual check, and Matrix Market exchange. It is a general-purpose leaf: it knows
// nothing of meshes or coils.
package sparse
