// Package mesh builds quality triangulations of tagged planar straight-line graphs: a constrained Delaunay
// triangulation refined in the style of Chew and Ruppert, with region tags, boundary-edge tags, optional
// quadratic (6-node) elements and point location. It is a general-purpose leaf: it knows nothing of coils.
//
// Conventions: triangles are counter-clockwise in the (X, Y) plane; eddyrz maps X = r and Y = z, in metres.
package mesh

// Point is a location in the plane.
type Point struct{ X, Y float64 }

// Segment is a constrained edge of a PSLG between Points[A] and Points[B]. Tag labels the boundary it lies on
// (0 for none); it is carried onto every mesh edge that the segment is split into.
type Segment struct {
	A, B int32
	Tag  int32
}

// RegionSeed gives Tag (> 0) to every triangle reachable from P without crossing a segment.
type RegionSeed struct {
	P   Point
	Tag int32
}

// PSLG is a planar straight-line graph: the mesher's input. The domain is the part of the plane enclosed by the
// segments; triangles outside the outermost closed boundary, or reachable from a hole point, are removed.
type PSLG struct {
	Points   []Point
	Segments []Segment
	Regions  []RegionSeed
	Holes    []Point
}

// SizeFunc returns the wanted edge length near p (same length unit as the points); it must be positive.
type SizeFunc func(p Point) float64

// Edge is a mesh edge that lies on an input segment: corner nodes A and B, midpoint node M (-1 for linear
// meshes) and the segment's Tag.
type Edge struct {
	A, B, M int32
	Tag     int32
}

// Mesh is a triangulation with region tags. Nodes holds the corner vertices first (NumVertices of them) and,
// once the mesh is quadratic, the edge-midpoint nodes after them.
type Mesh struct {
	Nodes       []Point
	NumVertices int
	// Tris are the corner nodes of each triangle, counter-clockwise.
	Tris [][3]int32
	// Tags is the region tag of each triangle (0 where no region seed reached it).
	Tags []int32
	// Mid is nil for a linear mesh; for a quadratic mesh Mid[t][k] is the node at the midpoint of the edge from
	// Tris[t][k] to Tris[t][(k+1)%3].
	Mid [][3]int32
	// Edges are the mesh edges that lie on input segments, with the segments' tags.
	Edges []Edge

	// cache holds the point-location index built on first use by Locate (see Locate); nil for a Mesh built
	// by hand, in which case Locate builds a fresh index on every call.
	cache *meshCache
}
