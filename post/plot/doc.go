// Package plot draws eddyrz results: field maps on the r-z triangle mesh (filled triangles coloured by a value,
// flux lines as exact contours of a nodal scalar, conductor outlines, colour bar), pictures of the mesh itself,
// and line charts (force against position, impedance against frequency, temperature against time). It builds on
// gonum.org/v1/plot and saves PNG, SVG or PDF files atomically.
//
// Conventions: mesh coordinates are metres with X = r and Y = z; every picture shows them in millimetres.
// Colours come from our own maps built in the OKLab colour space (see ColorMap).
package plot
