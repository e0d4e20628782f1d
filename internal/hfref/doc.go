// Package hfref holds reference solutions for the growth of a single
// hydraulic fracture, for the growth tests of the simulator to compare
// against.
//
// It gives, against time, the half-length, the opening at the inlet and
// the net pressure of two classical geometries under a constant injection
// rate with no leak-off:
//
//   - [KGD], a plane-strain fracture (Khristianovich & Zheltov 1955;
//     Geertsma & de Klerk 1969), in its two limiting regimes: toughness
//     dominated (the K-vertex of Detournay 2004, which is exact in closed
//     form: a uniform net pressure at which K_I = K_Ic) and viscosity
//     dominated (the M-vertex: Spence & Sharp 1985; Adachi & Detournay
//     2002), with the dimensionless toughness 𝒦 that says which applies;
//   - [PKN], a height-contained fracture without toughness (Perkins & Kern
//     1961; Nordgren 1972), from the similarity solution of Nordgren's
//     equation, whose constants this package's tests recompute; and
//     [Channel], the same equation for a fracture tracked by its mean
//     opening with the slot's cubic law, as the simulator tracks its
//     conduits (front 0.962 of Nordgren's).
//
// It is a package of its own, internal to the module, because it is
// neither simulator physics (mechanics and flow hold what runs) nor a
// test helper of one package: the growth tests of sim and the
// verification of flow and mechanics will both use it.
//
// # Units
//
// SI: lengths and openings in m, pressures and moduli in Pa, toughness in
// Pa·√m, viscosity in Pa·s, time in s. The KGD rate is per unit height
// (m²/s) and the PKN rate a volume rate (m³/s); both are the total rate
// into the two wings.
//
// # Conventions
//
// Plane-strain modulus E′ = E/(1 − ν²) = 2G/(1 − ν); Detournay's (2004)
// groups μ′ = 12μ and K′ = 4√(2/π)·K_Ic. Time runs from the start of
// injection into a fracture of zero length; the net pressure is the fluid
// pressure minus the minimum stress.
//
// [CrackStress] adds the stress around a 2-D crack opened by a uniform
// pressure (Westergaard 1939; Sneddon 1946), against which the shadows
// of pressurised cracks are checked (elastic's closed forms, Kachanov's
// (1987) average tractions for interacting conduits in sim).
//
// # References
//
// Westergaard, H.M. (1939), Bearing pressures and cracks, J. Appl. Mech.
// 6, A49–A53 (from memory).
//
// Kachanov, M. (1987), Elastic solids with many cracks: a simple method of
// analysis, Int. J. Solids Struct. 23(1), 23–43.
//
// Adachi, J.I. & Detournay, E. (2002), Self-similar solution of a
// plane-strain fracture driven by a power-law fluid, Int. J. Numer. Anal.
// Meth. Geomech. 26(6), 579–604.
//
// Detournay, E. (2004), Propagation regimes of fluid-driven fractures in
// impermeable rocks, Int. J. Geomech. 4(1), 35–45.
//
// Garagash, D.I. (2006), Plane-strain propagation of a fluid-driven
// fracture during injection and shut-in: asymptotics of large toughness,
// Eng. Fract. Mech. 73(4), 456–481 (the K-vertex in closed form).
//
// Geertsma, J. & de Klerk, F. (1969), A rapid method of predicting width
// and extent of hydraulically induced fractures, J. Pet. Tech. 21(12),
// 1571–1581.
//
// Khristianovich, S.A. & Zheltov, Y.P. (1955), Formation of vertical
// fractures by means of highly viscous liquid, Proc. 4th World Petroleum
// Congress, Rome, 579–586.
//
// Nordgren, R.P. (1972), Propagation of a vertical hydraulic fracture,
// SPE J. 12(4), 306–314.
//
// Perkins, T.K. & Kern, L.R. (1961), Widths of hydraulic fractures, J.
// Pet. Tech. 13(9), 937–949.
//
// Sneddon, I.N. (1946), The distribution of stress in the neighbourhood of
// a crack in an elastic solid, Proc. R. Soc. Lond. A 187, 229–260.
//
// Spence, D.A. & Sharp, P. (1985), Self-similar solutions for elastohydro-
// dynamic cavity flow, Proc. R. Soc. Lond. A 400, 289–313.
//
// Source status. The texts of these papers were not seen while writing
// this package (a search found their abstracts and citations only). The
// K-vertex and the PKN constants are derived here and checked by the
// tests; the M-vertex prefactors (0.6152, and 2.1 and 0.62 in the opening
// and pressure relations) are those quoted from Adachi & Detournay (2002)
// in secondary sources; Nordgren's printed 1.32 and 1.01, the
// dimensional 0.68 and 2.5 quoted from him and Detournay's regime bounds
// 𝒦 ≤ 1 and 𝒦 ≥ 4 are from memory. Each is marked where it is used.
// Geertsma & de Klerk's approximate constants are not included: they
// could not be confirmed.
package hfref
