// Package dfn generates stochastic discrete fracture networks and measures
// them: 3-D planar fractures from statistical sets (plus mapped fractures),
// their traces on the layer mid-plane, trace intersections, clusters, well
// crossings and intensity statistics.
//
// # Units
//
// Lengths are metres, areas square metres, intensities P10, P21 and P32 are
// 1/m, angles are radians (degrees only in the written files, whose column
// names say so).
//
// # Conventions
//
// Coordinates are local East-North-Up metres (x east, y north, z up) with the
// scenario's origin; a depth d (TVD, positive down) is z = −d. Orientations
// follow internal/orient: dip 0–π/2 below the horizontal, dip direction
// clockwise from north, and every fracture carries its upward unit normal
// n = (sin δ sin α, sin δ cos α, cos δ).
//
// A disc fracture has a radius (its "size"). A rectangle has its size as the
// length along strike and a height down dip equal to size × aspect ratio; its
// sides run along strike and down dip.
//
// Random numbers. Every draw comes from a PCG generator (math/rand/v2) whose
// two 64-bit seeds are the first 16 bytes, little endian, of
//
//	SHA-256("slipfront/dfn/v1" ‖ seed ‖ realization ‖ set ‖ purpose)
//
// with seed as uint64, realization and set as int64 (little endian) and
// purpose as its UTF-8 bytes (see Stream). Each set has its own streams for
// the fracture count, sizes, centres and orientations, so a realization never
// depends on what ran before it, on the number of workers, or on other sets.
//
// Generation (see Generate). A set's fractures form a Poisson process of
// centres with density λ (1/m³), each marked with an independent size and
// orientation. Only fractures that can reach the counting volume (the map
// rectangle × the layer) are kept: a fracture of extent e (radius, or
// half-diagonal of a rectangle) is kept when its centre lies in the counting
// volume enlarged by e on every side. The expected number kept is
//
//	N̄ = λ · E[(Lx + 2e)(Ly + 2e)(T + 2e)]
//
// which is a cubic in the size and so needs only the size law's first three
// moments. The kept sizes follow the size law weighted by that box volume, a
// mixture of the law weighted by s⁰, s¹, s² and s³, each of which has a
// closed-form sampler (SizeLaw.RandWeighted); each centre is then uniform in
// its own enlarged box. This is exactly the Poisson process restricted to the
// fractures that can touch the counting volume, so there is no edge bias,
// even for size laws without an upper bound, and no draws are wasted on
// fractures that could never be seen.
//
// Intensity. A P32 target gives λ = P32 / E[A] (docs/references.md §3.2: N =
// P32·V/E[A]); a P10 measured along a line l gives P32 = P10 / C13 with
// C13 = E|n·l| for the set's orientation law (docs/references.md §2.2); a count
// gives exactly that many kept fractures (the Poisson process conditioned on
// its number), λ = count / E[box volume]. For p32 and p10 the number kept is
// Poisson distributed with mean N̄, so the P32 target is met in expectation.
// Generate refuses, before drawing anything, a scenario whose N̄ summed over
// the sets plus the mapped fractures exceeds Numerics.MaxFractures
// (*CapError). Mapped fractures are added as they are, as rectangles of set
// KnownSet.
//
// Traces. The mid-plane is z = −Layer.Depth. In a fracture's own plane let u
// run along strike and v down dip from the centre; the mid-plane is the line
// v = v0 = (zc + depth)/sin δ. A disc crosses it when |v0| < r (trace = the
// chord of half-length √(r² − v0²)), a rectangle when |v0| < H/2 (trace = its
// full strike length). Fractures with dip below HorizontalDip make no trace.
// Traces are not clipped to the map. A trace's conducting height is the
// length, down dip in the fracture plane, of the layer interval
// [v0 − T/(2 sin δ), v0 + T/(2 sin δ)] intersected with the fracture's own
// down-dip extent through the trace midpoint ([−r, r] for a disc, whose
// trace midpoint is at u = 0; [−H/2, H/2] for a rectangle). It is one number
// per trace.
//
// Statistics (see Network.Stats). P32 is the fracture area inside the
// counting volume divided by its volume; the area of each fracture inside
// the box is computed exactly (the box cuts the fracture plane in a convex
// polygon; rectangles are clipped to it, and the area of a disc ∩ polygon is
// summed edge by edge from disc ∩ triangle areas). P21 is the trace length
// inside the map rectangle divided by the map area; P10 along a well is the
// number of map-view crossings divided by the map-view path length (for a
// lateral at mid-plane depth this equals the 3-D P10). Clusters are the
// connected components of the trace-intersection graph; an isolated trace is
// a cluster of its own.
//
// # References
//
// Fisher, R.A. (1953), Dispersion on a sphere, Proc. R. Soc. Lond. A 217,
// 295–305.
//
// Wood, A.T.A. (1994), Simulation of the von Mises Fisher distribution,
// Commun. Stat. – Simul. Comput. 23(1), 157–164, doi:10.1080/03610919408813161.
//
// Dershowitz, W.S. & Herda, H.H. (1992), Interpretation of fracture spacing
// and intensity, Proc. 33rd U.S. Symp. Rock Mech., Balkema, 757–766.
//
// Terzaghi, R.D. (1965), Sources of error in joint surveys, Géotechnique
// 15(3), 287–304.
//
// Devroye, L. (1986), Non-Uniform Random Variate Generation, Springer, §II.2.
//
// Santaló, L.A. (1976), Integral Geometry and Geometric Probability,
// Addison-Wesley.
//
// The formulas and check values used are collected, with derivations, in
// docs/references.md §1–§4.
package dfn
