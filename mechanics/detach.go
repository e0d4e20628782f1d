package mechanics

import (
	"math"

	"slipfront/elastic"
)

// Detaching a pair of elements (see ContactSettings.DetachRadius) removes
// two off-diagonal blocks from the operator, and removing entries from a
// positive definite matrix can make it indefinite: on a network of
// crossing traces the sliding elements' stiffness then has negative
// eigenvalues, the contact problem a direction of unbounded slip, and its
// iterations cycle or run away. Each removed pair is therefore compensated
// on the two diagonal blocks, which keeps the elastic energy positive.
//
// With E = J W A, J = diag(−1, 1) (the energy matrix: U = ½ zᵀ E z, see
// the elastic package), the pair's block E_ij = J W_i A_ij removed, and
// D_i = (E_ij E_ijᵀ)^½, D_j = (E_ijᵀ E_ij)^½ added to E_ii and E_jj, the
// change is
//
//	[ D_i     −E_ij ]   [  U ]     [  U ]ᵀ
//	[ −E_ijᵀ   D_j  ] = [ −V ] Σ  [ −V ]     ⪰ 0   (E_ij = U Σ Vᵀ),
//
// so the detached operator's energy is at least the full operator's. This
// is diagonal compensation of dropped entries, as in modified incomplete
// factorizations (Gustafsson 1978; Axelsson & Kolotilina 1994, from
// memory); the proof above is elementary. It stiffens the elements at
// crossings by the coupling they lose (a median of 12 % of an element's
// own shear stiffness per detached pair on the field-stage example's 5 m
// mesh), where the constant-element collocation is meaningless anyway.
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

// addBlock returns a + b.
func addBlock(a, b elastic.Block) elastic.Block {
	return elastic.Block{
		ShearSlip: a.ShearSlip + b.ShearSlip, ShearOpening: a.ShearOpening + b.ShearOpening,
		NormalSlip: a.NormalSlip + b.NormalSlip, NormalOpening: a.NormalOpening + b.NormalOpening,
	}
}
