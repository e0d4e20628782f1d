// Package mechanics resolves the in-situ stress on fracture planes and
// models Mohr–Coulomb slip, shear dilation, opening and the seismic moment
// of slip.
//
// It holds the stress state at the layer depth ([Stress], from gradients by
// [StressAtDepth]), its resolution on a plane ([Stress.Resolve]), the
// Coulomb criterion with slip and dilation tendency and the critical
// pore-pressure increase ([Coulomb]), the slip of a patch from its stress
// drop and stiffness ([SlipModel], [Stiffness]), the mechanical aperture
// with closure, dilation and opening ([ApertureModel]), moment and moment
// magnitude ([Moment], [MomentMagnitude]) and the pre-injection screening
// of a fracture population with its writers ([Screen], [Screening]).
//
// # Units
//
// SI throughout: stresses and pressures in Pa, lengths and apertures in m,
// areas in m², moments in N·m, angles in radians. Only the screening
// writers convert, to MPa and degrees, and they name the unit in every
// column or key.
//
// # Conventions
//
// Coordinates are East-North-Up (x east, y north, z up); azimuths are
// clockwise from north. Orientation conversions come from
// slipfront/internal/orient (docs/references.md §1.5).
//
// Stress is compression-positive (the rock-mechanics convention): S is the
// total stress tensor, p the pore pressure and σn′ = σn − p the effective
// normal stress. S1 ≥ S2 ≥ S3 are the principal stresses.
//
// A plane is given by a unit normal of either sense. It is turned to point
// up (n_z ≥ 0), so that it points into the hanging wall; for a vertical
// plane the hanging wall is the side the given normal points to. The slip
// direction is the direction in which the hanging wall moves relative to
// the footwall, ŝ = −(S·n − σn·n)/τ, and the rake follows Aki & Richards:
// rake = atan2(−ŝ·d, ŝ·s) with s the right-hand-rule strike and d the
// down-dip vector, so −90° is normal slip, +90° reverse, 0 left-lateral
// and ±180° right-lateral (docs/references.md §7.2).
//
// The screening assumes that a pore-pressure increase leaves the total
// stresses unchanged. A poroelastic stress path (docs/references.md §13,
// ΔSh = α(1−2ν)/(1−ν)·Δp under uniaxial strain) would raise the horizontal
// stresses with the pressure and so raise the critical increase; the
// screening does not include it.
//
// This is a screening and comparison tool. Pump pressures, well integrity
// and induced-seismicity limits follow local regulation and licensed
// engineering practice.
//
// # References
//
// Aki, K. (1966), Generation and propagation of G waves from the Niigata
// earthquake of June 16, 1964, part 2, Bull. Earthquake Res. Inst. Tokyo
// Univ. 44, 73–88 (seismic moment M0 = G·A·D).
//
// Aki, K. & Richards, P.G. (2002), Quantitative Seismology, 2nd ed.,
// University Science Books, ch. 4 (rake convention).
//
// Eshelby, J.D. (1957), The determination of the elastic field of an
// ellipsoidal inclusion, and related problems, Proc. R. Soc. Lond. A 241,
// 376–396 (circular shear crack).
//
// Ferrill, D.A. et al. (1999), Stressed rock strains groundwater at Yucca
// Mountain, Nevada, GSA Today 9(5), 1–8 (dilation tendency).
//
// Hanks, T.C. & Kanamori, H. (1979), A moment magnitude scale, J. Geophys.
// Res. 84(B5), 2348–2350, doi:10.1029/JB084iB05p02348.
//
// IASPEI (2013), Summary of magnitude working group recommendations on
// standard procedures for determining earthquake magnitudes from digital
// data (Mw = (2/3)(log10 M0 − 9.1), M0 in N·m).
//
// Jaeger, J.C., Cook, N.G.W. & Zimmerman, R.W. (2007), Fundamentals of
// Rock Mechanics, 4th ed., Blackwell, ch. 2 and 4 (stress on a plane,
// Coulomb criterion, frictional limit).
//
// Morris, A., Ferrill, D.A. & Henderson, D.B. (1996), Slip-tendency
// analysis and fault reactivation, Geology 24(3), 275–278.
//
// Pollard, D.D. & Segall, P. (1987), Theoretical displacements and
// stresses near fractures in rock, in Atkinson (ed.), Fracture Mechanics
// of Rock, Academic Press, 277–349 (2-D crack slip).
//
// Sneddon, I.N. (1946), The distribution of stress in the neighbourhood of
// a crack in an elastic solid, Proc. R. Soc. Lond. A 187, 229–260
// (opening of a pressurised crack).
//
// Willis-Richards, J., Watanabe, K. & Takahashi, H. (1996), Progress
// toward a stochastic rock mechanics model of engineered geothermal
// systems, J. Geophys. Res. 101(B8), 17481–17496 (aperture with closure
// and shear dilation).
//
// Zoback, M.D. (2007), Reservoir Geomechanics, Cambridge University Press,
// ch. 4 (frictional limit of the stress ratio).
//
// The check values of the tests are those of docs/references.md
// §6.2, §7 and §8, which cite these sources; there only Hanks & Kanamori
// (1979) was seen in a source text, the other citations and formulas are
// as commonly cited (docs/references.md marks them "from memory").
package mechanics
