// Package flow solves transient pressure diffusion on a fracture network.
//
// # Mesh
//
// BuildMesh splits every conducting path (a fracture trace or a primary
// conduit, with its conducting height; straight, or bent at the vertices
// Path.Via, which become nodes) at its junctions with other paths and at
// requested cuts (where wells feed it), then into elements no
// longer than the element length and no shorter than a fraction of it
// (MeshSettings.MinElementFraction, a quarter by default), except on a
// path shorter than that: boundary positions closer than that share a
// node, on which every junction and cut still lands.
// Elements meet at nodes; each pair of elements at a node is a connection
// whose transmissibility follows the star–delta rule of Karimi-Fard,
// Durlofsky & Aziz (2004), T_ij = α_i α_j / Σ_k α_k, with the cubic-law
// half-element conductance α = h e³ / (12 μ L/2) (Witherspoon et al. 1980);
// along a path this is the harmonic mean of the two halves. Elements marked
// in Config.CubeMean (a growing fracture's) meet one another through the
// mean of their apertures' cubes instead, the exact face flux where the
// aperture follows the pressure linearly, which lets a fluid front enter a
// closed element (see System).
//
// # Time step
//
// System.Step advances the pressures by backward Euler. The fluid content
// of an element is m = h L e (1 + c_f (p − p_ref)) (slightly compressible
// fluid in a pore volume that changes with the aperture e(p), which the
// caller supplies through an ApertureFunc together with ∂e/∂p). Picard
// iterations lag the transmissibilities and linearise the storage
// S = ∂m/∂p, so each iteration solves a symmetric positive definite system
// for the increment from the current iterate, relaxed with Aitken's
// dynamic factor; a step converges when pressures, apertures and the mass
// balance (injected − leaked − stored) have settled, the last to a
// tolerance not below what the pressures can represent (each element's
// storage, and each well connection's conductance over the step, times
// the last place of its pressure). Wells feed the network
// at nodes, under rate control (one extra unknown, the bottom-hole
// pressure, with Σ α_k (p_w − p_k) = Q), rate control capped by a pressure
// limit, pressure control, or shut-in (rate 0). Optional Carter leak-off
// removes 2·h·L·2C_L(√(t+dt−t₀) − √(t−t₀)) from each exposed element;
// alternatively (Config.Matrix) fluid leaks off by pressure diffusion into
// the rock matrix from both faces of every element, driven by the
// difference between the element's and the matrix's pressures (the matrix
// starts at the element's initial pressure) and discretised in a few cells
// per face, so it reverses below the matrix's pressure; its step equations are eliminated into a positive diagonal
// term and the system stays symmetric positive definite.
// StepSize adapts the time step to a target pressure change.
//
// # Limited entry
//
// LimitedEntry is the orifice pressure drop Δp = 8ρq²/(π²n²d⁴C_d²) of
// every perforation cluster of a stage. With Config.Perforations the
// System passes each cluster's fluid through it: a member of the
// cluster's star node, linearised at every iteration by its tangent
// (LimitedEntry.Tangent), so the clusters share the rate through the
// pressure balance. Split solves the same balance alone, for given
// pressures at the clusters' entries (a monotone root find on the
// bottom-hole pressure), as a reference.
//
// # Drainage
//
// Drainage is the depletion a producing parent well leaves in one layer
// before a stimulation nearby: single-phase, slightly compressible flow
// S ∂p/∂t = ∇·(λ∇p) on a regular map grid, closed at its edges, with the
// parent's propped fractures as held cells at the well's pressure
// (infinite conductivity). Finite volumes with harmonic-mean two-point
// transmissibilities and backward Euler in equal steps; the held cells are
// eliminated as known values, so each step solves a symmetric positive
// definite system on the free cells with the same Cholesky factor.
//
// # Linear algebra
//
// Each implicit time step and Picard iteration of the pressure equation
// gives a symmetric positive definite linear system
//
//	A = diag(s) + Σ_k t_k (e_i − e_j)(e_i − e_j)ᵀ,
//
// with s_i the storage (accumulation over the time step) of unknown i and
// t_k the transmissibility of connection k between unknowns i and j. The
// layer that solves it:
//
//   - CSR holds a square sparse matrix by rows, both triangles stored;
//     Assembler fills one whose pattern is fixed once from the connection
//     list and reused for every step (AddConnection adds a connection's
//     four terms through precomputed positions); its Residual sums
//     b − A x connection by connection, t_k (x_j − x_i), so terms t_k·x
//     of large transmissibilities do not cancel in floating point.
//   - LinearSolver is made once per pattern by Analyze and then reused:
//     Factor for new values, Solve for each right-hand side, neither
//     allocating. Method Cholesky is a sparse direct factorization
//     P A Pᵀ = L Lᵀ: approximate minimum degree ordering, elimination tree
//     postorder, column counts and the pattern of L once per pattern, then
//     an up-looking numeric factorization; the solve refines iteratively
//     when the residual misses the target. CGJacobi and CGIC0 are
//     preconditioned conjugate gradients on a copy renumbered by reverse
//     Cuthill–McKee; IC(0) retries with a diagonal shift after a
//     breakdown. Auto picks Cholesky unless the predicted nnz(L) exceeds a
//     budget. Settings and Result follow gonum's optimize: a Status, the
//     iterations and the relative residual ‖b − A x‖₂/‖b‖₂ computed from A;
//     ErrNotConverged and ErrNotPositiveDefinite are returned wrapped.
//   - ReadMatrixMarket, WriteMatrixMarket and their vector counterparts
//     exchange systems with other solvers in the NIST Matrix Market format
//     (coordinate real general or symmetric; array real general for
//     vectors); errors carry line numbers (FormatError).
//
// Fracture-network systems are nearly planar graphs made mostly of chains,
// so a fill-reducing ordering keeps L small (about 4·10⁶ entries for 10⁶
// unknowns of the reference model of docs/bench.md) and the direct
// method beats conjugate gradients, which need about 10³ iterations, by an
// order of magnitude.
//
// # Units
//
// The linear algebra is unit-free: it solves whatever consistent system it
// is given. In the flow equations, pressures are Pa, transmissibilities
// m³/(Pa·s) and storage terms m³/Pa divided by the time step, s.
// Perforation diameters are in m and fluid densities in kg/m³ (the
// perforation coefficient K in Pa·s²/m⁶); the matrix's permeability is in
// m², its compressibility in 1/Pa and its cells' thicknesses in m.
//
// # Conventions
//
// Unknowns and matrix indices are 0-based; Matrix Market files are
// 1-based, as the format prescribes. Matrices handed to Analyze must have
// a symmetric pattern with every diagonal entry stored; the values must be
// symmetric too (the direct method reads the lower triangle, CG all of
// it). Factor copies the values, so the matrix may be reassembled after
// it. Errors from bad data are returned; dimension mismatches in hot-path
// calls are programmer errors and panic with the prefix "flow:".
//
// # References
//
//   - Karimi-Fard, M., Durlofsky, L.J. & Aziz, K. (2004), "An efficient
//     discrete-fracture model applicable for general-purpose reservoir
//     simulators", SPE J. 9(2), 227–236, doi:10.2118/88812-PA (star–delta
//     transmissibilities at fracture intersections).
//   - Witherspoon, P.A., Wang, J.S.Y., Iwai, K. & Gale, J.E. (1980),
//     "Validity of cubic law for fluid flow in a deformable rock fracture",
//     Water Resour. Res. 16(6), 1016–1024, doi:10.1029/WR016i006p01016.
//   - Carslaw, H.S. & Jaeger, J.C. (1959), Conduction of Heat in Solids,
//     2nd ed., Oxford, §2.4 (the erfc solution the transient is checked
//     against).
//   - Crump, J.B. & Conway, M.W. (1988), "Effects of perforation-entry
//     friction on bottomhole treating analysis", J. Pet. Tech. 40(8),
//     1041–1048 (the perforation pressure drop, in field units; title and
//     pages from memory).
//   - Carter, R.D. (1957), "Derivation of the general equation for
//     estimating the extent of the fractured area", appendix to Howard,
//     G.C. & Fast, C.R., Drilling and Production Practice, API, 261–270
//     (leak-off ∝ 1/√t).
//   - Varga, R.S. (1962), Matrix Iterative Analysis, Prentice-Hall, ch. 3
//     (M-matrices and their non-negative inverses: the drainage's maximum
//     principle).
//   - Thomée, V. (2006), Galerkin Finite Element Methods for Parabolic
//     Problems, 2nd ed., Springer, ch. 7 (backward Euler after non-smooth
//     data: error of order Δt/t; why the drainage steps are equal).
//   - Irons, B.M. & Tuck, R.C. (1969), "A version of the Aitken accelerator
//     for computer iteration", Int. J. Numer. Meth. Eng. 1(3), 275–277;
//     Küttler, U. & Wall, W.A. (2008), "Fixed-point fluid–structure
//     interaction solvers with dynamic relaxation", Comput. Mech. 43,
//     61–72 (the relaxation factor).
//   - Amestoy, P.R., Davis, T.A. & Duff, I.S. (1996), "An approximate
//     minimum degree ordering algorithm", SIAM J. Matrix Anal. Appl. 17(4),
//     886–905, doi:10.1137/S0895479894278952.
//   - Davis, T.A. (2006), Direct Methods for Sparse Linear Systems, SIAM,
//     doi:10.1137/1.9780898718881 (elimination tree, column counts,
//     up-looking Cholesky, ch. 4).
//   - Gilbert, J.R., Ng, E.G. & Peyton, B.W. (1994), "An efficient
//     algorithm to compute row and column counts for sparse Cholesky
//     factorization", SIAM J. Matrix Anal. Appl. 15(4), 1075–1091,
//     doi:10.1137/S0895479892236921.
//   - Cuthill, E. & McKee, J. (1969), "Reducing the bandwidth of sparse
//     symmetric matrices", Proc. 24th ACM National Conference, 157–172,
//     doi:10.1145/800195.805928; George, A. & Liu, J.W.H. (1979), "An
//     implementation of a pseudoperipheral node finder", ACM Trans. Math.
//     Softw. 5(3), 284–295, doi:10.1145/355841.355845.
//   - Hestenes, M.R. & Stiefel, E. (1952), "Methods of conjugate gradients
//     for solving linear systems", J. Res. Natl. Bur. Stand. 49(6),
//     409–436, doi:10.6028/jres.049.044; Saad, Y. (2003), Iterative Methods
//     for Sparse Linear Systems, 2nd ed., SIAM, doi:10.1137/1.9780898718003.
//   - Meijerink, J.A. & van der Vorst, H.A. (1977), "An iterative solution
//     method for linear systems of which the coefficient matrix is a
//     symmetric M-matrix", Math. Comp. 31(137), 148–162,
//     doi:10.1090/S0025-5718-1977-0438681-4; Manteuffel, T.A. (1980), "An
//     incomplete factorization technique for positive definite linear
//     systems", Math. Comp. 34(150), 473–497,
//     doi:10.1090/S0025-5718-1980-0559197-0 (shifted IC).
//   - Higham, N.J. (2002), Accuracy and Stability of Numerical Algorithms,
//     2nd ed., SIAM, doi:10.1137/1.9780898718027 (iterative refinement,
//     error bounds used in the tests).
//   - Boisvert, R.F., Pozo, R. & Remington, K.A. (1996), "The Matrix Market
//     exchange formats: initial design", NISTIR 5935, National Institute of
//     Standards and Technology.
//
// DOIs and page ranges are from memory and should be checked before they
// are quoted elsewhere.
package flow
