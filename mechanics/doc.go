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
// For induced seismicity it holds linear slip-weakening friction
// ([SlipWeakening]), the nucleation half-length of Uenishi & Rice (2003)
// and the seismic/aseismic criterion built on it ([NucleationHalfLength],
// [Nucleation]), catalogue statistics (the maximum-likelihood b-value with
// its standard errors, [BValue]; the magnitude of completeness by maximum
// curvature, [MaxCurvatureCompleteness]; the truncated Gutenberg–Richter
// law and its sampler, [GutenbergRichter]), McGarr's (2014) bound on the
// largest induced moment ([MaxInducedMoment]) and the seismicity-rate
// model of Dieterich (1994) with an exact integrator for piecewise-linear
// stress histories and a seeded event sampler ([SeismicityRate]).
//
// # Units
//
// SI throughout: stresses and pressures in Pa, lengths and apertures in m,
// areas in m², moments in N·m, angles in radians. Only the screening
// writers convert, to MPa and degrees, and they name the unit in every
// column or key. Weakening rates are in Pa/m, seismicity rates in
// events/s, the seismicity state γ in s/Pa and stressing rates in Pa/s;
// magnitudes are moment magnitudes Mw.
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
// The seismicity-rate model is loaded by a Coulomb stress S = τ − μ(σn − p)
// on the population's faults: S rises with shear stress and with pore
// pressure, and its steps and rates are what [SeismicityRate] takes.
//
// This is a screening and comparison tool. Pump pressures, well integrity
// and induced-seismicity limits follow local regulation and licensed
// engineering practice.
//
// # References
//
// Aki, K. (1965), Maximum likelihood estimate of b in the formula
// log N = a − bM and its confidence limits, Bull. Earthquake Res. Inst.
// Tokyo Univ. 43, 237–239.
//
// Aki, K. (1966), Generation and propagation of G waves from the Niigata
// earthquake of June 16, 1964, part 2, Bull. Earthquake Res. Inst. Tokyo
// Univ. 44, 73–88 (seismic moment M0 = G·A·D).
//
// Aki, K. & Richards, P.G. (2002), Quantitative Seismology, 2nd ed.,
// University Science Books, ch. 4 (rake convention).
//
// Cosentino, P., Ficarra, V. & Luzio, D. (1977), Truncated exponential
// frequency-magnitude relationship in earthquake statistics, Bull.
// Seismol. Soc. Am. 67(6), 1615–1623.
//
// Crouch, S.L. & Starfield, A.M. (1983), Boundary Element Methods in Solid
// Mechanics, George Allen & Unwin, ch. 5 (constant displacement-
// discontinuity elements; the nucleation test's crack).
//
// Dascalu, C., Ionescu, I.R. & Campillo, M. (2000), Fault finiteness and
// initiation of dynamic shear instability, Earth Planet. Sci. Lett. 177,
// 163–176.
//
// Devroye, L. (1986), Non-Uniform Random Variate Generation, Springer,
// §II.2 (inverse-transform sampling).
//
// Dieterich, J.H. (1994), A constitutive law for rate of earthquake
// production and its application to earthquake clustering, J. Geophys.
// Res. 99(B2), 2601–2618.
//
// Eshelby, J.D. (1957), The determination of the elastic field of an
// ellipsoidal inclusion, and related problems, Proc. R. Soc. Lond. A 241,
// 376–396 (circular shear crack).
//
// Ferrill, D.A. et al. (1999), Stressed rock strains groundwater at Yucca
// Mountain, Nevada, GSA Today 9(5), 1–8 (dilation tendency).
//
// Gutenberg, B. & Richter, C.F. (1944), Frequency of earthquakes in
// California, Bull. Seismol. Soc. Am. 34(4), 185–188.
//
// Hanks, T.C. & Kanamori, H. (1979), A moment magnitude scale, J. Geophys.
// Res. 84(B5), 2348–2350, doi:10.1029/JB084iB05p02348.
//
// IASPEI (2013), Summary of magnitude working group recommendations on
// standard procedures for determining earthquake magnitudes from digital
// data (Mw = (2/3)(log10 M0 − 9.1), M0 in N·m).
//
// Ida, Y. (1972), Cohesive force across the tip of a longitudinal-shear
// crack and Griffith's specific surface energy, J. Geophys. Res. 77(20),
// 3796–3805 (slip-weakening cohesive zone).
//
// Jaeger, J.C., Cook, N.G.W. & Zimmerman, R.W. (2007), Fundamentals of
// Rock Mechanics, 4th ed., Blackwell, ch. 2 and 4 (stress on a plane,
// Coulomb criterion, frictional limit).
//
// Mason, J.C. & Handscomb, D.C. (2003), Chebyshev Polynomials, Chapman &
// Hall/CRC, ch. 9 (finite Hilbert transforms; the nucleation test).
//
// McGarr, A. (1976), Seismic moments and volume changes, J. Geophys. Res.
// 81(8), 1487–1494.
//
// McGarr, A. (2014), Maximum magnitude earthquakes induced by fluid
// injection, J. Geophys. Res. Solid Earth 119, 1008–1019,
// doi:10.1002/2013JB010597.
//
// Morris, A., Ferrill, D.A. & Henderson, D.B. (1996), Slip-tendency
// analysis and fault reactivation, Geology 24(3), 275–278.
//
// Palmer, A.C. & Rice, J.R. (1973), The growth of slip surfaces in the
// progressive failure of over-consolidated clay, Proc. R. Soc. Lond. A
// 332, 527–548 (linear slip weakening, W = (τp − τr)/Dc).
//
// Pollard, D.D. & Segall, P. (1987), Theoretical displacements and
// stresses near fractures in rock, in Atkinson (ed.), Fracture Mechanics
// of Rock, Academic Press, 277–349 (2-D crack slip).
//
// Shi, Y. & Bolt, B.A. (1982), The standard error of the
// magnitude-frequency b value, Bull. Seismol. Soc. Am. 72(5), 1677–1687.
//
// Sneddon, I.N. (1946), The distribution of stress in the neighbourhood of
// a crack in an elastic solid, Proc. R. Soc. Lond. A 187, 229–260
// (opening of a pressurised crack).
//
// Uenishi, K. & Rice, J.R. (2003), Universal nucleation length for
// slip-weakening rupture instability under nonuniform fault loading,
// J. Geophys. Res. 108(B1), 2042, doi:10.1029/2001JB001681.
//
// Utsu, T. (1966), A statistical significance test of the difference in
// b-value between two earthquake groups, J. Phys. Earth 14, 37–40
// (half-bin correction of the b-value).
//
// Wiemer, S. & Wyss, M. (2000), Minimum magnitude of completeness in
// earthquake catalogs: examples from Alaska, the western United States,
// and Japan, Bull. Seismol. Soc. Am. 90(4), 859–869.
//
// Willis-Richards, J., Watanabe, K. & Takahashi, H. (1996), Progress
// toward a stochastic rock mechanics model of engineered geothermal
// systems, J. Geophys. Res. 101(B8), 17481–17496 (aperture with closure
// and shear dilation).
//
// Woessner, J. & Wiemer, S. (2005), Assessing the quality of earthquake
// catalogues: estimating the magnitude of completeness and its
// uncertainty, Bull. Seismol. Soc. Am. 95(2), 684–698.
//
// Zoback, M.D. (2007), Reservoir Geomechanics, Cambridge University Press,
// ch. 4 (frictional limit of the stress ratio).
//
// The check values of the tests are those of docs/references.md
// §6.2, §7 and §8, which cite these sources; there only Hanks & Kanamori
// (1979) was seen in a source text, the other citations and formulas are
// as commonly cited (docs/references.md marks them "from memory").
//
// For the seismicity pieces, the abstracts or citations of Dascalu et al.
// (2000), Dieterich (1994), McGarr (2014), Shi & Bolt (1982), Uenishi &
// Rice (2003), Wiemer & Wyss (2000) and Woessner & Wiemer (2005) were
// seen in a source; the other citations, the titles of Ida (1972), Palmer
// & Rice (1973) and Utsu (1966), and all equation numbers are from memory.
// The nucleation constant was computed for slipfront ([NucleationFactor]).
package mechanics
