package mechanics

import (
	"fmt"
	"math"
	"slices"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
)

// conjugateX returns the contact problem of two straight faults 20 m long
// crossing at right angles at their midpoints, n elements each (groups 0
// and 1), in plane strain, with slip-weakening friction of weakening rate
// (μs − μd)σn′/Dc = 1.7·10⁹ Pa/m at σn′ = 30 MPa, closed (ShearOnly), and
// the crossing coupled or detached.
//
// The rate lies between the two critical rates of the faults sliding
// whole: 2.24·10⁹ Pa/m for one alone and 1.25·10⁹ Pa/m for the two
// together at 16 elements each (the smallest eigenvalues of their
// stiffness per element area, measured on this geometry). The lone
// fault's agrees with Uenishi & Rice (2003), W = 0.579·μ*/c = 2.32·10⁹
// Pa/m for c = 10 m and μ* = G/(1−ν) = 40 GPa, within the constant
// elements' error; the pair is softer because slip on each unloads the
// other where they touch.
func conjugateX(t *testing.T, n int, couple bool) *Contact {
	t.Helper()
	const half, sigma = 10.0, 30e6
	f := SlipWeakening{Static: 0.6, Residual: 0.5, CriticalSlip: 0.1 * sigma / 1.7e9}
	var elems []elastic.Element
	var ce []ContactElement
	for g, d := range []r2.Vec{{X: 1}, {Y: 1}} {
		for i := range n {
			a, b := -half+2*half*float64(i)/float64(n), -half+2*half*float64(i+1)/float64(n)
			e := elastic.Element{P0: r2.Scale(a, d), P1: r2.Scale(b, d), Height: 1}
			elems = append(elems, e)
			ce = append(ce, ContactElement{Element: e, Group: g, Shear: 0.6 * sigma, Normal: sigma, Friction: f})
		}
	}
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	h := 2 * half / float64(n)
	c, err := NewContact(op, ce, ContactSettings{NearRadius: 4 * half, Tolerance: 1e-10, ShearOnly: true, DetachRadius: 0.6 * h, CoupleCrossings: couple})
	if err != nil {
		t.Fatal(err)
	}
	c.Begin(c.NewState(), uniform(len(elems), 0))
	return c
}

// Two faults that cross at a kept crossing are judged unstable together:
// with every element of conjugateX's faults sliding and weakening, each
// fault alone is stable (its rate is below its critical rate) but the
// two together are not, and the unstable patch is both faults' elements.
// Detached, the crossing no longer couples them and each fault's patch,
// checked alone, is stable.
func TestContactStabilityAcrossCrossing(t *testing.T) {
	const n = 16
	for _, couple := range []bool{true, false} {
		c := conjugateX(t, n, couple)
		if couple && c.PinnedCrossings() != 0 {
			t.Fatalf("the right-angled crossing is pinned in %d places, want it kept", c.PinnedCrossings())
		}
		s, all := allSliding(c)
		for g := range 2 {
			if lambda := s.patchStability(all[g*n : (g+1)*n]); !math.IsInf(lambda, 1) {
				t.Errorf("coupled %v: fault %d alone has smallest eigenvalue %g, want stable", couple, g, lambda)
			}
		}
		lambda, patch := s.stability()
		switch {
		case couple && !(lambda < 0 && slices.Equal(patch, all)):
			t.Errorf("coupled: smallest eigenvalue %g over %d elements, want the two faults' %d elements unstable together", lambda, len(patch), 2*n)
		case !couple && !math.IsInf(lambda, 1):
			t.Errorf("detached: smallest eigenvalue %g over %d elements, want each fault stable alone", lambda, len(patch))
		}
	}
}

// A rupture's runs on the two faults of a kept crossing are one rupture,
// nucleated where the earlier of the two groups' instabilities began; the
// same runs on detached faults are two ruptures, each of one fault, the
// one without a recorded nucleation placed at its largest slip at the end
// of the step.
func TestRupturesJoinAtKeptCrossing(t *testing.T) {
	const n = 16
	for _, couple := range []bool{true, false} {
		c := conjugateX(t, n, couple)
		tr := &c.trial
		run0, run1 := []int{5, 6, 7, 8, 9}, []int{n + 6, n + 7, n + 8, n + 9, n + 10} // both through the crossing
		for _, i := range append(slices.Clone(run0), run1...) {
			tr.ruptured[i] = true
			tr.ds[i] = 1e-3
		}
		tr.ds[n+9] = 2e-3
		tr.nucleations[0] = nucleation{element: 7, fraction: 0.25}
		got := tr.rupturesOf(c)
		if couple {
			if len(got) != 1 || !slices.Equal(got[0].Elements, append(slices.Clone(run0), run1...)) || got[0].Nucleation != 7 || got[0].Fraction != 0.25 {
				t.Errorf("coupled: ruptures %+v, want one of both runs nucleated at element 7 at 0.25 of the step", got)
			}
			continue
		}
		if len(got) != 2 || !slices.Equal(got[0].Elements, run0) || got[0].Nucleation != 7 || got[0].Fraction != 0.25 ||
			!slices.Equal(got[1].Elements, run1) || got[1].Nucleation != n+9 || got[1].Fraction != 1 {
			t.Errorf("detached: ruptures %+v, want the two runs apart", got)
		}
	}
}

// A kept crossing detached after a stall (detachStalled, detachCrossing)
// leaves the contact problem the one built with that crossing detached
// from the start: the same self-influences (each pair compensated once),
// the same near lists (sorted, as influence searches them), the same
// detached pairs, and the place counted as pinned. Errors other than a
// stall among its elements detach nothing.
func TestDetachStalledCrossing(t *testing.T) {
	const n = 16
	c, want := conjugateX(t, n, true), conjugateX(t, n, false)
	if len(c.crossingMembers) != 1 || !c.crossingKept[0] {
		t.Fatalf("%d crossings, kept %v: want the X's one, kept", len(c.crossingMembers), c.crossingKept)
	}
	if c.detachStalled(ErrContactNotConverged) || c.detachStalled(&stall{err: ErrContactNotConverged, elems: []int{0, n - 1}}) {
		t.Fatal("detached a crossing for an error that names none of its elements")
	}
	member := c.crossingMembers[0][0]
	if !c.detachStalled(fmt.Errorf("step: %w", &stall{err: ErrContactNotConverged, elems: []int{member}})) {
		t.Fatal("a stall at the crossing detached nothing")
	}
	if c.crossingKept[0] || c.detachStalled(&stall{err: ErrContactNotConverged, elems: []int{member}}) {
		t.Fatal("the crossing is still kept, or was detached twice")
	}
	if got := c.PinnedCrossings(); got != 1 {
		t.Errorf("%d places pinned after the detachment, want 1", got)
	}
	for i := range 2 * n {
		if d := subBlock(c.self[i], want.self[i]); math.Abs(d.ShearSlip)+math.Abs(d.NormalSlip)+math.Abs(d.ShearOpening)+math.Abs(d.NormalOpening) > 1e-9*math.Abs(want.self[i].ShearSlip) {
			t.Errorf("element %d: self-influence %+v, want %+v", i, c.self[i], want.self[i])
		}
		if !slices.Equal(c.near[i], want.near[i]) {
			t.Errorf("element %d: near %v, want %v", i, c.near[i], want.near[i])
		}
		got, exp := slices.Clone(c.detached[i]), slices.Clone(want.detached[i])
		slices.Sort(got)
		slices.Sort(exp)
		if !slices.Equal(got, exp) {
			t.Errorf("element %d: detached %v, want %v", i, got, exp)
		}
	}
}
