// Package elastic computes how the slip and opening of fracture elements
// change the tractions on every other element, by the two-dimensional
// displacement discontinuity method with a finite-height correction.
//
// Elements are straight segments in the map plane, each a vertical
// fracture patch of a given height (plane strain in the map plane). An
// Operator maps the slip s and opening w of every element to the change
// of shear traction Δτ and normal stress Δσn at every element's centre.
// Dense stores every coefficient; Hierarchical stores a hierarchical
// matrix (cluster tree, adaptive cross approximation) in O(N log N)
// memory with a product of the same cost; New picks one by size, and
// EstimateMemory predicts the memory before assembly. Field evaluates the
// stress change at fixed map points (for maps of the Coulomb stress
// change), Probe at any point by direct summation (for a few points not
// known in advance), and Stress resolves it on a receiver plane.
//
// This package is linear elasticity only: friction, fluid pressure and
// time belong to its callers.
//
// # Kernel
//
// Each element carries a constant displacement discontinuity; its stress
// field is that of Crouch & Starfield (1983, §5.2), and the tractions are
// collocated at element centres. Every coefficient between two elements
// a distance d apart (centre to centre) is multiplied by Olson's (2004)
// factor
//
//	F = 1 − d^β / [d² + (h/α)²]^{β/2},  β = 2.3, α = 1,
//
// which leaves the self-influence unchanged and makes interactions fade
// beyond a few heights h, as they do around fractures of finite height.
// Settings.PlaneStrain switches it off. For two elements of different
// heights the pair height is the geometric mean (h_i h_j)^½ and the
// coefficient is also multiplied by (h_j/h_i)^½ (see below). The
// constants β and α are from memory and were not checked against the
// paper; with them, a long crack (length ≫ h) under net pressure p opens
// to w = π(1−ν)ph/(G I(β)) ≈ 2.39 (1−ν)ph/G, about 2.4 times the
// plane-strain width of a cross-section of height h (the PKN width), so
// absolute openings of long cracks should not be trusted, while
// interaction (stress shadows) is what the factor was made for.
//
// # Reciprocity
//
// Collocation at element centres is not reciprocal for elements of
// different lengths or orientations, so each coefficient is the mean of
// its two collocation estimates (see below), which makes the operator
// exactly reciprocal (Maxwell–Betti) with element areas W = L h as
// weights:
//
//	Σ_i W_i (Δσn^A_i w^B_i − Δτ^A_i s^B_i) = Σ_i W_i (Δσn^B_i w^A_i − Δτ^B_i s^A_i),
//
// (in plane strain, with lengths W = L), and the elastic energy is
// U = ½ Σ_i W_i (Δσn_i w_i − Δτ_i s_i) ≥ 0. The pair height and the
// factor (h_j/h_i)^½ are the only power-law choice that keeps this for
// elements of different heights; for equal heights they are Olson's.
// Hierarchical uses the reciprocity to store half of the symmetric
// matrix J W^½ A W^-½, J = diag(−1, 1).
//
// # Hierarchical matrix
//
// Elements are clustered by bisecting bounding boxes into leaves of at
// most 64 elements (Settings.LeafSize); two clusters are admissible when
// min(diam) ≤ η·dist (η = Settings.Admissibility, 3 by default).
// Admissible blocks are compressed by adaptive cross approximation with
// partial pivoting on 2×2 pivot blocks and recompressed by QR and SVD;
// the others are stored dense. The tolerance ε (Settings.Tolerance, 10⁻⁶
// by default) bounds the Frobenius norm of the error relative to that of
// the whole operator, ‖A − Ã‖_F ≤ ε‖A‖_F, shared among the blocks in
// proportion to their sizes (blocks below their share are dropped).
// Blocks are stored in single precision, which limits ε to ≥ 10⁻⁷, and
// runs of consecutive blocks share one allocation, in the order products
// read them; products sum the diagonal blocks in double precision and the
// others in single precision, block by block, with gonum's vectorized
// kernels. Assembly and products run in parallel on Settings.Workers
// goroutines, and their results do not depend on the number of workers.
// Products are bound by memory bandwidth: the defaults (η = 3, leaves of
// 64) were chosen by timing products on DFN-like networks of 10⁴ and 10⁵
// elements against η = 1–6 and leaves of 16–128 (larger leaves store more
// but stream faster; at 10⁵ leaves of 128 exceed 1 GB). On such networks
// with ε = 10⁻⁶ the mean rank is 12–19 and the memory about 4.5 kB per
// element at 10³ elements, 6.8 kB at 10⁴ and 9.5 kB at 10⁵ (O(N log N)).

// # Units
//
// SI throughout: positions, lengths, heights, slip and opening in m;
// shear modulus, tractions and stresses in Pa; influence coefficients in
// Pa/m.
//
// # Conventions
//
// Coordinates are map coordinates, x east and y north, m. An element
// runs from P0 to P1; its tangent is t = (P1 − P0)/|P1 − P0| and its
// normal n = (−t_y, t_x), t turned by +90° (anticlockwise seen from
// above).
//
//   - Slip s: displacement of the side that n points to relative to the
//     other side, along t. Positive slip is right-lateral (dextral), and
//     does not depend on the order of P0 and P1.
//   - Opening w: separation of the faces along n, positive apart.
//   - Δτ: the change of the shear traction σ_tn with the sign that drives
//     positive slip; with the stress S compression-positive, Δτ = −t·ΔS·n.
//   - Δσn: the change of normal stress, compression-positive, n·ΔS·n.
//   - Stress (Field, Stress): compression-positive, in the x, y frame.
//
// So the self-influence has ∂Δτ_i/∂s_i = −G/(π(1−ν)a_i) < 0 (slip relaxes
// the shear stress that drives it) and ∂Δσn_i/∂w_i = +G/(π(1−ν)a_i) > 0
// (an opened crack compresses itself, and its parallel neighbours: the
// stress shadow), a_i the half-length. A crack whose faces carry the
// pressure p in a rock without remote load opens until Δσn = p, as in
// Sneddon (1946). Internally the kernel follows Crouch & Starfield's
// convention, D = u(0⁻) − u(0⁺) and tension-positive stress, so that
// s = −D_x, w = −D_y, Δτ = σ_tn and Δσn = −σ_nn.
//
// Invalid elements or material give an *InputError; coincident element
// centres, or a centre on another element's tip (where the stress is
// singular), a *GeometryError. Misuse (slices of the wrong length) panics
// with the prefix "elastic:".
//
// # References
//
//   - Crouch, S.L. & Starfield, A.M. (1983), Boundary Element Methods in
//     Solid Mechanics, George Allen & Unwin, London, ch. 5 (constant
//     displacement discontinuity elements; equation numbers from memory).
//   - Olson, J.E. (2004), "Predicting fracture swarms — the influence of
//     subcritical crack growth and the crack-tip process zone on joint
//     spacing in rock", in Cosgrove, J.W. & Engelder, T. (eds), The
//     Initiation, Propagation, and Arrest of Joints and Other Fractures,
//     Geol. Soc. London Spec. Publ. 231, 73–87 (the height factor; β and α
//     from memory, not checked in the paper).
//   - Sneddon, I.N. (1946), "The distribution of stress in the
//     neighbourhood of a crack in an elastic solid", Proc. R. Soc. Lond. A
//     187, 229–260.
//   - Pollard, D.D. & Segall, P. (1987), "Theoretical displacements and
//     stresses near fractures in rock: with applications to faults,
//     joints, veins, dikes, and solution surfaces", in Atkinson, B.K.
//     (ed.), Fracture Mechanics of Rock, Academic Press, 277–349.
//   - Kachanov, M. (1987), "Elastic solids with many cracks: a simple
//     method of analysis", Int. J. Solids Struct. 23(1), 23–43.
//   - Betti, E. (1872), "Teoria dell'elasticità", Il Nuovo Cimento 7–8
//     (the reciprocal theorem).
//   - Hackbusch, W. (1999), "A sparse matrix arithmetic based on
//     H-matrices. Part I: Introduction to H-matrices", Computing 62(2),
//     89–108.
//   - Bebendorf, M. (2000), "Approximation of boundary element matrices",
//     Numer. Math. 86(4), 565–589; Bebendorf, M. & Rjasanow, S. (2003),
//     "Adaptive low-rank approximation of collocation matrices",
//     Computing 70(1), 1–24; Bebendorf, M. (2008), Hierarchical
//     Matrices, Springer (recompression, §1.1.5).
//   - Bradley, A.M. (2014), "H-matrix and block error tolerances for
//     source-boundary-element methods applied to displacement
//     discontinuities", Seismol. Res. Lett. 85(6) (title from memory).
//   - King, G.C.P., Stein, R.S. & Lin, J. (1994), "Static stress changes
//     and the triggering of earthquakes", Bull. Seismol. Soc. Am. 84(3),
//     935–953 (Coulomb stress change).
package elastic
