package mechanics

import (
	"math"

	"slipfront/elastic"
)

// At crossings the collocated influences are meaningless, and both ways
// of using the operator there fail: kept, they make the elastic energy of
// slip indefinite (on the test's random crossing networks the full
// operator has negative eigenvalues), and detaching the pairs (see
// ContactSettings.DetachRadius), which removes two off-diagonal blocks,
// can leave it indefinite too (the demo's realization 3
// on 5 m elements, and those networks in plane strain). The contact
// problem then has directions of unbounded slip, and its iterations cycle
// or run away. Each removed pair is therefore compensated on the two
// diagonal blocks.
//
// With E = J W A, J = diag(−1, 1) (the energy matrix: U = ½ zᵀ E z, see
// the elastic package), the pair's block E_ij = J W_i A_ij removed, and
// D_i = (E_ij E_ijᵀ)^½, D_j = (E_ijᵀ E_ij)^½ added to E_ii and E_jj, the
// change is
//
//	[ D_i     −E_ij ]   [  U ]     [  U ]ᵀ
//	[ −E_ijᵀ   D_j  ] = [ −V ] Σ  [ −V ]     ⪰ 0   (E_ij = U Σ Vᵀ),
//
// so the energy of any slip is raised by a positive semidefinite term,
// never lowered. This is diagonal compensation of dropped entries, as in
// modified incomplete factorizations (Gustafsson 1978; Axelsson &
// Kolotilina 1994, from memory); the identity above is elementary. It does
// not prove the result definite (the full operator is not), but on every
// network tried it was, where the detached one was not (the tests). It
// stiffens the elements at crossings by the coupling they lose (on the
// demo's 5 m mesh, with the band of two element lengths used first, a
// detached pair's block had a largest singular value of a median 12 %, at
// most 5.9 times, of an element's own shear stiffness): crossings pin the
// slip around them, over the
// DetachRadius, a band that narrows as the elements do.
//
// Without openings as unknowns (ContactSettings.ShearOnly) only the
// slip–slip part of E_ij is compensated (D = |e_ss| on the slip
// diagonals): the openings are the caller's, and its crack compliance
// must not see a changed self-influence.

// compensation returns the blocks to add to the self-influences A_ii and
// A_jj of receiver i (area wi) and source j (area wj) when the pair's
// block aij = A_ij is removed.
func compensation(aij elastic.Block, wi, wj float64, shearOnly bool) (ci, cj elastic.Block) {
	// E_ij = J W_i A_ij, row-major [[e00, e01], [e10, e11]].
	e00, e01 := -wi*aij.ShearSlip, -wi*aij.ShearOpening
	e10, e11 := wi*aij.NormalSlip, wi*aij.NormalOpening
	if shearOnly {
		e01, e10, e11 = 0, 0, 0
	}
	// E Eᵀ and Eᵀ E.
	di := sqrtSym2(e00*e00+e01*e01, e00*e10+e01*e11, e10*e10+e11*e11)
	dj := sqrtSym2(e00*e00+e10*e10, e00*e01+e10*e11, e01*e01+e11*e11)
	// A_kk += J D_k / W_k.
	toBlock := func(d [3]float64, w float64) elastic.Block {
		return elastic.Block{ShearSlip: -d[0] / w, ShearOpening: -d[1] / w, NormalSlip: d[1] / w, NormalOpening: d[2] / w}
	}
	return toBlock(di, wi), toBlock(dj, wj)
}

// sqrtSym2 returns the square root of the symmetric positive
// semidefinite matrix [[a, b], [b, c]] as (a', b', c'): for 2×2 matrices
// √M = (M + √det M · I)/√(tr M + 2√det M).
func sqrtSym2(a, b, c float64) [3]float64 {
	s := math.Sqrt(math.Max(a*c-b*b, 0))
	t := math.Sqrt(a + c + 2*s)
	if t == 0 {
		return [3]float64{}
	}
	return [3]float64{(a + s) / t, b / t, (c + s) / t}
}

// subBlock returns a − b.
func subBlock(a, b elastic.Block) elastic.Block {
	return elastic.Block{
		ShearSlip: a.ShearSlip - b.ShearSlip, ShearOpening: a.ShearOpening - b.ShearOpening,
		NormalSlip: a.NormalSlip - b.NormalSlip, NormalOpening: a.NormalOpening - b.NormalOpening,
	}
}

// addBlock returns a + b.
func addBlock(a, b elastic.Block) elastic.Block {
	return elastic.Block{
		ShearSlip: a.ShearSlip + b.ShearSlip, ShearOpening: a.ShearOpening + b.ShearOpening,
		NormalSlip: a.NormalSlip + b.NormalSlip, NormalOpening: a.NormalOpening + b.NormalOpening,
	}
}
