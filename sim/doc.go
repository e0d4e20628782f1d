// Package sim runs the coupled stimulation of one fracture network: the
// pumping schedule drives pressure diffusion along the fractures (package
// flow), pressure lowers the effective normal stress until fractures slip
// under slip-weakening friction while every element loads every other
// through the elastic operator (packages elastic and mechanics), slip
// dilates the fractures and raises their transmissivity, and ruptures are
// recorded as synthetic microseismic events while slip grows a stimulated
// area.
//
// Run is a visible sequence: set up the mesh, the elastic operator and the
// contact problem, then for every stage in pumping order repeat [flow step
// → contact solve → accept or cut the step → commit and record] until the
// stage's volume or duration is pumped and its shut-in is over. With
// growing fractures and numerics.path_passes > 1 that sequence runs once
// per pass, each pass meshing the fractures' paths through the directions
// of SHmax its predecessor's tips met (path.go); each pass records over
// the one before, and the last one's result is the run's.
//
// # Coupling
//
// Flow and slip are coupled sequentially within a step (mech.go): the
// backward-Euler flow step, with its Picard iterations, sees the slip and
// the stresses of the last accepted step, so every aperture depends on its
// own pressure only (Willis-Richards et al. 1996, with crack opening where
// p > σn; a chord slope where an element crosses that kink between
// iterations). At the step's end pressures the friction-contact problem of
// all elements (mechanics.Contact) gives the slip; the step is cut when
// the flow does not converge or when the new slip of an element exceeds
// numerics.slip_max (down to 16 times the minimum step: a rupture cannot be
// split). On acceptance the slip is committed, the crack openings of
// conduits and jacked fractures load the other fractures (stress shadows),
// and the ruptures become events. The lag of dilation and shadows behind
// the pressure is one step, bounded by slip_max. The next step grows or
// shrinks with the largest pressure change against
// numerics.pressure_change_max. With numerics.interaction = off each
// element feels only its own slip.
//
// # Stimulated area
//
// An element counts as stimulated once its accumulated slip reaches
// numerics.stimulated_slip. The stimulated area is the exact map area of
// the region within numerics.stimulated_reach of a stimulated element (the
// union of the elements' stadiums, overlaps counted once; package
// internal/footprint); no grid enters it. The stimulated fracture area is
// the sum of length × height of stimulated elements; the stimulated volume
// is the stimulated area times the layer thickness. None of them ever
// decreases. The map cells that stimulated elements pass through
// (numerics.cell_size) are kept for pictures, rasters and probability
// maps only.
//
// # Units
//
// SI throughout: m, s, Pa, m³, m³/s; outputs carry their units in column
// names (pressure_MPa, area_m2).
//
// # Conventions
//
// Local East-North coordinates in metres; depth positive down; stress
// compression-positive; element pressures are absolute pore pressures.
//
// # References
//
// Willis-Richards, J., Watanabe, K. & Takahashi, H. (1996), Progress toward
// a stochastic rock mechanics model of engineered geothermal systems, J.
// Geophys. Res. 101(B8), 17481–17496.
//
// Crouch, S.L. & Starfield, A.M. (1983), Boundary Element Methods in Solid
// Mechanics, George Allen & Unwin (the elastic operator, package elastic).
//
// Sneddon, I.N. (1946), The distribution of stress in the neighbourhood of
// a crack in an elastic solid, Proc. R. Soc. A 187, 229–260 (the opening
// of a pressurised crack and its elliptical profile).
//
// Uenishi, K. & Rice, J.R. (2003), Universal nucleation length for
// slip-weakening rupture instability under nonuniform fault loading, J.
// Geophys. Res. 108(B1), 2042 (the resolution warning).
//
// Aki, K. (1966), Generation and propagation of G waves from the Niigata
// earthquake of June 16, 1964, Bull. Earthq. Res. Inst. 44, 73–88 (M0 = G·A·D).
//
// Hanks, T.C. & Kanamori, H. (1979), A moment magnitude scale, J. Geophys.
// Res. 84(B5), 2348–2350, doi:10.1029/JB084iB05p02348.
//
// Amanatides, J. & Woo, A. (1987), A fast voxel traversal algorithm for ray
// tracing, Eurographics '87, 3–10 (the cells a segment passes through).
package sim
