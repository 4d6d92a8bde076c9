package study

// MeshInfo summarises a model's mesh for reports: sizes, quality and the triangles in each named region.
type MeshInfo struct {
	Nodes          int          `json:"nodes"`
	Vertices       int          `json:"vertices"`
	Triangles      int          `json:"triangles"`
	Order          int          `json:"order"`
	MinAngleDeg    float64      `json:"min_angle_deg"`
	MaxAspectRatio float64      `json:"max_aspect_ratio"`
	Regions        []RegionMesh `json:"regions"`
	MeshSeconds    float64      `json:"mesh_s"`
}

// RegionMesh is one region's share of the mesh; AreaM2 is the meshed area and ExactAreaM2 the shape's own.
type RegionMesh struct {
	Name        string  `json:"name"`
	Triangles   int     `json:"triangles"`
	AreaM2      float64 `json:"area_m2"`
	ExactAreaM2 float64 `json:"exact_area_m2,omitempty"`
	SkinDepthM  float64 `json:"skin_depth_m,omitempty"`
}

// MeshInfo returns the mesh summary of the model.
func (md *Model) MeshInfo() MeshInfo {
	q := md.Mesh.Quality()
	info := MeshInfo{
		Nodes: len(md.Mesh.Nodes), Vertices: md.Mesh.NumVertices, Triangles: len(md.Mesh.Tris),
		Order: md.Layout.Order, MinAngleDeg: q.MinAngleDeg, MaxAspectRatio: q.MaxAspectRatio,
		MeshSeconds: md.MeshTime.Seconds(),
	}
	byTag := make(map[int32]int, len(q.Regions))
	for i, rs := range q.Regions {
		byTag[rs.Tag] = i
	}
	for _, r := range md.Layout.Regions {
		rm := RegionMesh{Name: r.Name, ExactAreaM2: r.Area, SkinDepthM: r.SkinDepth}
		if i, ok := byTag[r.Tag]; ok {
			rm.Triangles, rm.AreaM2 = q.Regions[i].Count, q.Regions[i].Area
		}
		info.Regions = append(info.Regions, rm)
	}
	return info
}
