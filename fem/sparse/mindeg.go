package sparse

import "math"

// minimumDegree orders by exact minimum degree on the explicit elimination graph: repeatedly eliminate a vertex
// of least current degree and make its neighbours a clique. Dense rows and vertices whose coordinates are NaN (when
// coords are given) are held back and numbered last. Its cost grows with the fill, so it suits small and medium systems.
func minimumDegree(g *graph, coords [][2]float64) []int32 {
	n := g.n()
	adj := make([][]int32, n)
	for v := range adj {
		adj[v] = append([]int32(nil), g.nbrs(int32(v))...)
	}
	held := make([]bool, n)
	dense := denseThreshold(n)
	for v := range held {
		held[v] = len(adj[v]) > dense || (len(coords) == n && (math.IsNaN(coords[v][0]) || math.IsNaN(coords[v][1])))
	}
	// Degree buckets as doubly linked lists.
	head := make([]int32, n+1)
	for i := range head {
		head[i] = -1
	}
	next := make([]int32, n)
	prev := make([]int32, n)
	deg := make([]int32, n)
	insert := func(v int32) {
		d := int32(len(adj[v]))
		deg[v] = d
		prev[v] = -1
		next[v] = head[d]
		if head[d] >= 0 {
			prev[head[d]] = v
		}
		head[d] = v
	}
	remove := func(v int32) {
		if prev[v] >= 0 {
			next[prev[v]] = next[v]
		} else {
			head[deg[v]] = next[v]
		}
		if next[v] >= 0 {
			prev[next[v]] = prev[v]
		}
	}
	for v := 0; v < n; v++ {
		if !held[v] {
			insert(int32(v))
		}
	}
	mark := make([]int32, n)
	stamp := int32(0)
	perm := make([]int32, 0, n)
	done := make([]bool, n)
	mind := 0
	for {
		for mind <= n && head[mind] < 0 {
			mind++
		}
		if mind > n {
			break
		}
		v := head[mind]
		remove(v)
		done[v] = true
		perm = append(perm, v)
		nv := adj[v]
		adj[v] = nil
		for _, u := range nv {
			stamp++
			mark[v] = stamp
			mark[u] = stamp
			merged := make([]int32, 0, len(adj[u])+len(nv))
			for _, w := range adj[u] {
				if mark[w] != stamp {
					mark[w] = stamp
					merged = append(merged, w)
				}
			}
			for _, w := range nv {
				if mark[w] != stamp {
					mark[w] = stamp
					merged = append(merged, w)
				}
			}
			adj[u] = merged
			if !held[u] {
				remove(u)
				insert(u)
				mind = min(mind, len(merged))
			}
		}
	}
	for v := 0; v < n; v++ {
		if !done[v] {
			perm = append(perm, int32(v))
		}
	}
	return perm
}
