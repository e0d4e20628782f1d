// Package sim runs the coupled stimulation of one fracture network: the
// pumping schedule drives pressure diffusion along the fractures (package
// flow), pressure lowers the effective normal stress until fractures slip
// under Mohr–Coulomb friction (package mechanics), slip dilates the
// fractures and raises their transmissivity, and the slipped patches are
// recorded as synthetic microseismic events and as a growing stimulated
// area.
//
// Run is a visible sequence: set up the mesh and the mechanical state,
// then for every stage in pumping order repeat [flow step ⇄ mechanics
// update → accept or cut the step → record] until the stage's volume or
// duration is pumped and its shut-in is over.
//
// # Coupling
//
// Each time step is one backward-Euler flow step whose Picard iterations
// call back into the mechanics: at the current element pressures every
// natural-fracture element is checked against τ ≥ c + μs·σn′. Contiguous
// slipping elements of one fracture form a patch; its shear stress drops
// to the residual μd·σn′ and it slips by the mean stress drop over the
// patch stiffness (mechanics.SlipModel). The aperture follows from the
// effective normal stress and the accumulated slip (Willis-Richards et al.
// 1996), with crack opening where p > σn. An element that slipped in one
// iteration of a step stays slipping for the rest of that step (slip is
// irreversible), which keeps the iterations from cycling across the
// threshold. The aperture's pressure derivative handed to the flow solver
// includes how an element's own pressure changes its patch's slip and so
// its dilation, a diagonal Newton-like term that lets the linearised
// storage see the pore volume slip opens. The step is accepted when pressures, apertures and the mass
// balance have converged; it is cut when they do not, or when the new slip
// of an element exceeds numerics.slip_max (down to 16 times the minimum
// step: a single patch's slip cannot be split). The next step grows or
// shrinks with the largest pressure change against
// numerics.pressure_change_max.
//
// Stresses are resolved once per fracture from the in-situ stress tensor:
// there is no elastic interaction between slipping patches (a boundary
// element model can replace the patch stiffness later) and no poroelastic
// stress change.
//
// # Stimulated area
//
// An element counts as stimulated once its accumulated slip reaches
// numerics.stimulated_slip. The stimulated map area is the number of map
// cells (numerics.cell_size) that stimulated elements pass through, times
// the cell area; the stimulated fracture area is the sum of length × height
// of stimulated elements; the stimulated volume is the map area times the
// layer thickness. None of them ever decreases.
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
// Aki, K. (1966), Generation and propagation of G waves from the Niigata
// earthquake of June 16, 1964, Bull. Earthq. Res. Inst. 44, 73–88 (M0 = G·A·D).
//
// Hanks, T.C. & Kanamori, H. (1979), A moment magnitude scale, J. Geophys.
// Res. 84(B5), 2348–2350, doi:10.1029/JB084iB05p02348.
//
// Amanatides, J. & Woo, A. (1987), A fast voxel traversal algorithm for ray
// tracing, Eurographics '87, 3–10 (the cells a segment passes through).
package sim
