// Package mechanics resolves the in-situ stress on fracture planes and
// models Mohr–Coulomb slip, shear dilation, opening and the seismic moment
// of slip.
//
// It holds the stress state at the layer depth ([Stress], from gradients by
// [StressAtDepth]), its resolution on a plane ([Stress.Resolve]), the
// Coulomb criterion with slip and dilation tendency and the critical
// pore-pressure increase ([Coulomb]), slip-weakening friction
// ([SlipWeakening]) and the quasi-static friction contact of elastically
// interacting fracture elements ([Contact]), crack stiffnesses
// ([Stiffness]), the mechanical aperture
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
// For depletion before a refracture or a child well it holds the
// uniaxial-strain stress path ([Poroelastic]), the stress change that a
// depleted region leaves in a layer of finite thickness ([Layer]): around a
// uniformly depleted ellipse ([NewDepletedEllipse]) and for a depletion
// field on a grid, summed directly or by FFT ([NewGridResponse]); the new
// horizontal principal stresses and the rotation of SHmax ([Horizontal],
// [SHmaxRotation], [ChangedHorizontals]); and the changed stress state on
// which the screening resolves the fractures ([Stress.Changed]).
//
// For hydraulic fracture growth it holds the stress intensity factors at
// a crack tip read from the displacement discontinuity of a constant tip
// element, with the element's √(2/π) correction ([TipIntensity],
// [TipElementCorrection]), the kink angle and mode-I-equivalent intensity
// of the maximum circumferential stress criterion of Erdogan & Sih (1963)
// ([KinkAngle], [EquivalentIntensity]), and the outcome where a growing
// fracture meets a natural one — cross, arrest or divert — by the
// criterion of Renshaw & Pollard (1995) extended to oblique approach
// ([Approach], [OrthogonalCrossingRatio]); the contact problem holds the
// intact rock ahead of a tip still ([ContactElement].Intact) until the tip
// reaches it ([Contact.Release]).
//
// # Units
//
// SI throughout: stresses and pressures in Pa, lengths and apertures in m,
// areas in m², moments in N·m, angles in radians. Only the screening
// writers convert, to MPa and degrees, and they name the unit in every
// column or key. Weakening rates are in Pa/m, seismicity rates in
// events/s, the seismicity state γ in s/Pa and stressing rates in Pa/s;
// magnitudes are moment magnitudes Mw. Depletion grids have cell sizes in
// m and one pore-pressure change, Pa, per cell; Biot's coefficient and
// Poisson's ratio are dimensionless.
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
// screening does not include it for the injection. Depletion before the
// stimulation does change the stresses: [Stress.Changed] adds a depletion's
// horizontal stress change and its pore-pressure change to the in-situ
// state (ΔSv = 0, the constant overburden of the stress path), and the
// screening then resolves the fractures in the changed state.
//
// A depletion's stress change is that of a layer of the given thickness in
// a homogeneous linear elastic whole space, on the layer's mid-plane
// (docs/references.md §13.1; see [Layer] for the model, its limits and
// what it leaves out). A [StressChange] is compression-positive: depletion
// (Δp < 0) lowers the stresses where it acts. The SHmax rotation is
// positive clockwise, in [−π/2, π/2].
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
// Biot, M.A. (1941), General theory of three-dimensional consolidation,
// J. Appl. Phys. 12, 155–164.
//
// Cosentino, P., Ficarra, V. & Luzio, D. (1977), Truncated exponential
// frequency-magnitude relationship in earthquake statistics, Bull.
// Seismol. Soc. Am. 67(6), 1615–1623.
//
// Crouch, S.L. & Starfield, A.M. (1983), Boundary Element Methods in Solid
// Mechanics, George Allen & Unwin, ch. 5 (constant displacement-
// discontinuity elements; the nucleation test's crack).
//
// Erdogan, F. & Sih, G.C. (1963), On the crack extension in plates under
// plane loading and transverse shear, J. Basic Eng. 85(4), 519–525
// (maximum circumferential stress criterion).
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
// Engelder, T. & Fischer, M.P. (1994), Influence of poroelastic behavior
// on the magnitude of minimum horizontal stress, Sh, in overpressured parts
// of sedimentary basins, Geology 22, 949–952.
//
// Eshelby, J.D. (1957), The determination of the elastic field of an
// ellipsoidal inclusion, and related problems, Proc. R. Soc. Lond. A 241,
// 376–396 (circular shear crack; the elliptic cylinder of the depletion
// model).
//
// Ferrill, D.A. et al. (1999), Stressed rock strains groundwater at Yucca
// Mountain, Nevada, GSA Today 9(5), 1–8 (dilation tendency).
//
// Geertsma, J. (1973), Land subsidence above compacting oil and gas
// reservoirs, J. Pet. Tech. 25, 734–744 (nucleus of strain).
//
// Goodier, J.N. (1937), On the integration of the thermo-elastic
// equations, Phil. Mag. 23, 1017–1032 (displacement potential of a region
// with a free strain).
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
// Gu, H., Weng, X., Lund, J., Mack, M., Ganguly, U. & Suarez-Rivera, R.
// (2012), Hydraulic fracture crossing natural fracture at nonorthogonal
// angles: a criterion and its validation, SPE Prod. & Oper. 27(1), 20–26.
//
// Ida, Y. (1972), Cohesive force across the tip of a longitudinal-shear
// crack and Griffith's specific surface energy, J. Geophys. Res. 77(20),
// 3796–3805 (slip-weakening cohesive zone).
//
// Irwin, G.R. (1957), Analysis of stresses and strains near the end of a
// crack traversing a plate, J. Appl. Mech. 24, 361–364 (the near-tip
// field and its opening).
//
// Jaeger, J.C., Cook, N.G.W. & Zimmerman, R.W. (2007), Fundamentals of
// Rock Mechanics, 4th ed., Blackwell, ch. 2 and 4 (stress on a plane,
// Coulomb criterion, frictional limit).
//
// Kellogg, O.D. (1929), Foundations of Potential Theory, Springer,
// ch. VI–VII (potential of a disc on its axis and of a homogeneous
// ellipsoid).
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
// Mura, T. (1987), Micromechanics of Defects in Solids, 2nd ed., Martinus
// Nijhoff, §11 (exterior field of an ellipsoidal inclusion).
//
// Nagy, D., Papp, G. & Benedek, J. (2000), The gravitational potential and
// its derivatives for the prism, J. Geodesy 74, 552–560.
//
// Palmer, A.C. & Rice, J.R. (1973), The growth of slip surfaces in the
// progressive failure of over-consolidated clay, Proc. R. Soc. Lond. A
// 332, 527–548 (linear slip weakening, W = (τp − τr)/Dc).
//
// Pollard, D.D. & Segall, P. (1987), Theoretical displacements and
// stresses near fractures in rock, in Atkinson (ed.), Fracture Mechanics
// of Rock, Academic Press, 277–349 (2-D crack slip).
//
// Press, W.H., Teukolsky, S.A., Vetterling, W.T. & Flannery, B.P. (2007),
// Numerical Recipes, 3rd ed., Cambridge University Press, §13.1
// (convolution by FFT with zero padding).
//
// Rudnicki, J.W. (2011), Eshelby's technique for analyzing inhomogeneities
// in geomechanics, in Mechanics of Crustal Rocks, CISM Courses and Lectures
// 533, Springer.
//
// Segall, P. (1989), Earthquakes triggered by fluid extraction, Geology
// 17, 942–946.
//
// Segall, P. (1992), Induced stresses due to fluid extraction from
// axisymmetric reservoirs, Pure Appl. Geophys. 139, 535–560.
//
// Segall, P. & Fitzgerald, S.D. (1998), A note on induced stress changes
// in hydrocarbon and geothermal reservoirs, Tectonophysics 289, 117–128.
//
// Shi, Y. & Bolt, B.A. (1982), The standard error of the
// magnitude-frequency b value, Bull. Seismol. Soc. Am. 72(5), 1677–1687.
//
// Renshaw, C.E. & Pollard, D.D. (1995), An experimentally verified
// criterion for propagation across unbounded frictional interfaces in
// brittle, linear elastic materials, Int. J. Rock Mech. Min. Sci. 32(3),
// 237–249.
//
// Sneddon, I.N. (1946), The distribution of stress in the neighbourhood of
// a crack in an elastic solid, Proc. R. Soc. Lond. A 187, 229–260
// (opening of a pressurised crack).
//
// Timoshenko, S.P. & Goodier, J.N. (1970), Theory of Elasticity, 3rd ed.,
// McGraw-Hill, ch. 13 (thermal stress around a heated cylinder).
//
// Trefethen, L.N. & Weideman, J.A.C. (2014), The exponentially convergent
// trapezoidal rule, SIAM Review 56(3), 385–458.
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
// Williams, M.L. (1957), On the stress distribution at the base of a
// stationary crack, J. Appl. Mech. 24, 109–114.
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
// ch. 4 (frictional limit of the stress ratio) and ch. 12 (depletion).
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
//
// For the depletion pieces (docs/references.md §13 and §13.1), the
// abstracts of Segall (1989) and Rudnicki (2011) and the citations of
// Geertsma (1973), Segall (1992) and Nagy, Papp & Benedek (2000) were seen;
// the other citations and all formulas are from memory. The closed forms
// the code uses were derived for slipfront and checked against brute-force
// integrals (docs/scripts/depletion.py).
//
// For the growth pieces no source text was seen: the titles, pages and
// equations of Erdogan & Sih (1963), Irwin (1957), Williams (1957),
// Renshaw & Pollard (1995) and Gu et al. (2012) are from memory. The
// constants 0.35 and 1.06 of Renshaw & Pollard's criterion are derived
// here from the near-tip field (√2/4 and 3√2/4), the tip-element
// correction from the constant-element crack of docs/references.md §9.2,
// and the oblique-approach criterion is slipfront's own formulation in
// the manner of Gu et al., not a transcription of theirs.
package mechanics
