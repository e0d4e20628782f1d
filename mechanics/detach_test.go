package mechanics

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
)

func TestSqrtSym2(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for range 100 {
		// M = Bᵀ B is symmetric positive semidefinite.
		b := [4]float64{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		if rng.IntN(4) == 0 {
			b[2], b[3] = 2*b[0], 2*b[1] // rank one
		}
		a, off, c := b[0]*b[0]+b[2]*b[2], b[0]*b[1]+b[2]*b[3], b[1]*b[1]+b[3]*b[3]
		r := sqrtSym2(a, off, c)
		got := [3]float64{r[0]*r[0] + r[1]*r[1], r[0]*r[1] + r[1]*r[2], r[1]*r[1] + r[2]*r[2]}
		for k, want := range [3]float64{a, off, c} {
			if math.Abs(got[k]-want) > 1e-12*(a+c) {
				t.Fatalf("√M² = %v, want %v", got, [3]float64{a, off, c})
			}
		}
		if r[0] < 0 || r[2] < 0 || r[0]*r[2]-r[1]*r[1] < -1e-12*(a+c) {
			t.Fatalf("√M = %v is not positive semidefinite", r)
		}
	}
}

// crossingNetwork returns twelve traces of sixteen 1 m elements, 3 m
// high, at random positions and strikes in a 10 m square: many crossings.
func crossingNetwork(seed uint64) ([]elastic.Element, []ContactElement) {
	rng := rand.New(rand.NewPCG(seed, 7))
	var elems []elastic.Element
	var ce []ContactElement
	f := SlipWeakening{Static: 0.6, Residual: 0.6, CriticalSlip: 1e-3}
	for g := range 12 {
		th := math.Pi * rng.Float64()
		d := r2.Vec{X: math.Cos(th), Y: math.Sin(th)}
		c0 := r2.Vec{X: 10 * rng.Float64(), Y: 10 * rng.Float64()}
		for i := -8; i < 8; i++ {
			e := elastic.Element{P0: r2.Add(c0, r2.Scale(float64(i), d)), P1: r2.Add(c0, r2.Scale(float64(i+1), d)), Height: 3}
			elems = append(elems, e)
			ce = append(ce, ContactElement{Element: e, Group: g, Shear: 1e6, Normal: 2e7, Friction: f})
		}
	}
	return elems, ce
}

// energyMatrix returns E = J W A (J = diag(−1, 1): U = ½ zᵀ E z, see the
// elastic package) over slip, or slip and opening, of every element, with
// the blocks of block(i, j), symmetrized.
func energyMatrix(n int, weight []float64, shearOnly bool, block func(i, j int) (elastic.Block, bool)) ([]float64, int) {
	dof := 2
	if shearOnly {
		dof = 1
	}
	nn := dof * n
	e := make([]float64, nn*nn)
	for i := range n {
		for j := range n {
			b, ok := block(i, j)
			if !ok {
				continue
			}
			w := weight[i]
			vals := [2][2]float64{{-w * b.ShearSlip, -w * b.ShearOpening}, {w * b.NormalSlip, w * b.NormalOpening}}
			for r := range dof {
				for q := range dof {
					v := 0.5 * vals[r][q]
					e[(r*n+i)*nn+q*n+j] += v
					e[(q*n+j)*nn+r*n+i] += v
				}
			}
		}
	}
	return e, nn
}

// Detached pairs are compensated so that the contact problem's elastic
// energy is never below the full operator's: E_contact − E_full ⪰ 0
// (the identity in compensation), and on these crossing networks it is
// positive definite. Neither alternative is: the full operator's slip
// energy is indefinite on them, and so is the detached operator's without
// compensation in plane strain, the failure that made the whole-set
// solves of crossing traces cycle (checked here; no source).
func TestDetachCompensation(t *testing.T) {
	var kept, crossings int
	for _, radius := range detachRadii {
		for seed := range uint64(4) {
			for _, planeStrain := range []bool{true, false} {
				for _, shearOnly := range []bool{true, false} {
					for _, coupled := range []bool{false, true} {
						t.Run(fmt.Sprintf("radius%g/seed%d/planeStrain=%v/shearOnly=%v/coupled=%v", radius, seed, planeStrain, shearOnly, coupled), func(t *testing.T) {
							k, n, pinned := checkDetachCompensation(t, seed, radius, planeStrain, shearOnly, coupled)
							kept, crossings = kept+k, crossings+n
							// The detached pairs of the crossings not kept,
							// joined where they share elements.
							if coupled && (pinned > n-k || (pinned == 0) != (k == n)) {
								t.Errorf("%d places pinned, want 1 to the %d of %d crossings not kept", pinned, n-k, n)
							}
							if !coupled && pinned == 0 {
								t.Error("detached, nothing pinned")
							}
						})
					}
				}
			}
		}
	}
	// Coupled, the networks must exercise both outcomes.
	if kept == 0 || kept == crossings {
		t.Errorf("coupled: %d of %d crossings kept, want some kept and some detached", kept, crossings)
	}
	t.Logf("coupled: %d of %d crossings kept", kept, crossings)
}

// checkDetachCompensation runs TestDetachCompensation's checks on one
// case and returns how many crossings it kept of how many (with coupled
// crossings, CoupleCrossings; none without), and how many it pinned.
func checkDetachCompensation(t *testing.T, seed uint64, radius float64, planeStrain, shearOnly, coupled bool) (kept, crossings, pinned int) {
	t.Helper()
	elems, ce := crossingNetwork(seed)
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: planeStrain})
	if err != nil {
		t.Fatal(err)
	}
	c, err := NewContact(op, ce, ContactSettings{NearRadius: 100, DetachRadius: radius, ShearOnly: shearOnly, CoupleCrossings: coupled})
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range c.crossingKept {
		if k {
			kept++
		}
	}
	n := len(elems)
	if c.NearPairs()+countDetached(c) != n*(n-1) {
		t.Fatalf("near and detached pairs %d + %d, want every pair of %d elements", c.NearPairs(), countDetached(c), n)
	}
	contact, nn := energyMatrix(n, c.weight, shearOnly, c.influence)
	full, _ := energyMatrix(n, c.weight, shearOnly, func(i, j int) (elastic.Block, bool) { return op.At(i, j), true })
	uncompensated, _ := energyMatrix(n, c.weight, shearOnly, func(i, j int) (elastic.Block, bool) {
		if i == j {
			return op.At(i, i), true // the self-influence before compensation
		}
		return c.influence(i, j)
	})
	scale := -c.weight[0] * c.self[0].ShearSlip
	diff := make([]float64, len(full))
	for k := range diff {
		diff[k] = contact[k] - full[k]
	}
	if l := smallestEigen(diff, nn); l < -1e-9*scale {
		t.Errorf("E_contact − E_full has eigenvalue %.3g < 0 (scale %.3g)", l, scale)
	}
	if l := smallestEigen(contact, nn); !(l > 0) {
		t.Errorf("contact energy has eigenvalue %.3g ≤ 0", l)
	}
	if l := smallestEigen(full, nn); l >= 0 {
		t.Errorf("the full operator's energy has smallest eigenvalue %.3g ≥ 0: this network does not show why pairs are detached", l)
	}
	if planeStrain && shearOnly && !coupled {
		if l := smallestEigen(uncompensated, nn); l >= 0 {
			t.Errorf("without compensation the slip energy's smallest eigenvalue is %.3g ≥ 0: this network does not show the failure", l)
		}
	}
	return kept, len(c.crossingKept), c.PinnedCrossings()
}

// detachRadii are the detach radii the crossing tests run with, m, on
// their 1 m elements: the touching elements only (sim's 0.6 element
// lengths) and a wider band.
var detachRadii = []float64{0.6, 1}

func countDetached(c *Contact) int {
	var k int
	for _, l := range c.detached {
		k += len(l)
	}
	return k
}

// The contact solve on a crossing network in plane strain, every element
// pressurised past its strength, solved as one system (few sweeps): with
// the compensation every solve converges and the slip stays small
// (0.12–0.15 mm here; Δτ·L/G for the whole 16 m traces is about 0.75 mm;
// coupled, seeds 2 and 3 rupture, to μd, and stay below 1 mm too).
// Without it, the same solves failed at every seed and pressure tried
// (Newton stalled, with slips up to 1 m), which is how the demo
// example's realization 3 stopped.
func TestContactCrossingNetworkConverges(t *testing.T) {
	for _, coupled := range []bool{false, true} {
		for _, radius := range detachRadii {
			for seed := range uint64(4) {
				solveCrossingNetwork(t, seed, radius, coupled)
			}
		}
	}
}

// solveCrossingNetwork is one case of TestContactCrossingNetworkConverges.
func solveCrossingNetwork(t *testing.T, seed uint64, radius float64, coupled bool) {
	t.Helper()
	elems, ce := crossingNetwork(seed)
	for i := range ce {
		ce[i].Friction = SlipWeakening{Static: 0.6, Residual: 0.5, CriticalSlip: 1e-3}
	}
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	c, err := NewContact(op, ce, ContactSettings{NearRadius: 100, DetachRadius: radius, ShearOnly: true, MaxIterations: 8, CoupleCrossings: coupled})
	if err != nil {
		t.Fatal(err)
	}
	n := len(elems)
	c.Begin(c.NewState(), make([]float64, n))
	for _, p := range []float64{1.86e7, 1.9e7} { // strength 0.6(σn − p) < τ = 1 MPa from p = 18.3 MPa
		res, err := c.Solve(uniform(n, p))
		if err != nil {
			t.Fatalf("radius %g m, seed %d, coupled %v, p = %g Pa: %v", radius, seed, coupled, p, err)
		}
		if res.Active != n {
			t.Errorf("seed %d, p = %g Pa: %d elements in the working set, want all %d", seed, p, res.Active, n)
		}
		// Ruptures included (coupled, a crossing network that weakens can
		// become unstable: res.MaxSlip leaves its ruptured elements out).
		largest := 0.0
		for _, ds := range c.trial.ds {
			largest = math.Max(largest, math.Abs(ds))
		}
		if !(largest > 0 && largest < 1e-3) {
			t.Errorf("seed %d, p = %g Pa: largest slip %.3g m (ruptured: %v), want in (0, 1 mm)", seed, p, largest, res.Ruptured)
		}
	}
}

// Intact rock (the path ahead of a growing fracture's tip) cannot move:
// overloaded with the rest, it does not slip, and the pairs it touches are
// not compensated (no slip of it can make the energy indefinite). Once
// Release has freed every element of the intact trace, each element's
// self-influence is the one all its pairs give (within rounding), as if
// it had been ordinary from the start, and it slips.
func TestContactIntactRelease(t *testing.T) {
	elems, ce := crossingNetwork(1)
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	set := ContactSettings{NearRadius: 100, DetachRadius: 0.6, ShearOnly: true}
	ordinary, err := NewContact(op, slices.Clone(ce), set)
	if err != nil {
		t.Fatal(err)
	}
	var intact []int
	for i := range ce {
		if ce[i].Group == 0 {
			ce[i].Intact = true
			intact = append(intact, i)
		}
	}
	c, err := NewContact(op, ce, set)
	if err != nil {
		t.Fatal(err)
	}
	n := len(elems)
	slipOf := func(c *Contact) []float64 {
		st := c.NewState()
		c.Begin(st, uniform(n, 0))
		if _, err := c.Solve(uniform(n, 1.9e7)); err != nil {
			t.Fatal(err)
		}
		return slices.Clone(c.trial.ds)
	}
	ds := slipOf(c)
	for _, i := range intact {
		if ds[i] != 0 {
			t.Fatalf("intact element %d slipped %g m", i, ds[i])
		}
	}
	differ := 0
	for i := range n {
		if c.self[i] != ordinary.self[i] {
			differ++
		}
	}
	if differ == 0 {
		t.Fatal("no self-influence lacks a compensation: the intact trace touches nothing")
	}
	for _, i := range intact {
		c.Release(i)
		c.Release(i) // a second release changes nothing
	}
	for i := range n {
		got, want := c.self[i].ShearSlip, ordinary.self[i].ShearSlip
		if math.Abs(got-want) > 1e-12*math.Abs(want) {
			t.Errorf("element %d: self-influence %.15g after release, %.15g ordinary", i, got, want)
		}
	}
	ds = slipOf(c)
	moved := 0
	for _, i := range intact {
		if ds[i] != 0 {
			moved++
		}
	}
	if moved == 0 {
		t.Error("no released element slipped")
	}
	t.Logf("%d self-influences lacked a compensation; %d of %d released elements slipped", differ, moved, len(intact))
}

// CountNearPairs, known before a Contact is built, counts the pairs its
// near field and its detached list hold together.
func TestCountNearPairs(t *testing.T) {
	elems, ce := crossingNetwork(2)
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{})
	if err != nil {
		t.Fatal(err)
	}
	for _, radius := range []float64{2, 3.5, 100} {
		c, err := NewContact(op, ce, ContactSettings{NearRadius: radius, DetachRadius: 0.6})
		if err != nil {
			t.Fatal(err)
		}
		if got, want := CountNearPairs(elems, radius), c.NearPairs()+countDetached(c); got != want || want == 0 {
			t.Errorf("radius %g m: %d pairs counted, the contact holds %d", radius, got, want)
		}
	}
}

// What the detachment at crossings costs: two straight faults 20 m long
// crossing at their midpoints, both past their constant strength by
// Δτ = 0.5 MPa, in plane strain. With every pair kept (these X's make no
// indefinite directions) the summed slip × length of each fault converges
// at first order in the element length, as constant elements do on a lone
// crack (Crouch & Starfield 1983); at 60° to a value above the lone
// crack's (1−ν)Δτπc²/G (Pollard & Segall 1987): each fault's slip loads
// the other. With the touching pairs detached and compensated (sim's 0.6
// element lengths) the crossing is pinned and the sums lie below the kept
// pairs' at every element length. At 60° they rise towards them far more
// slowly (by 5.9, 4.9 and 4.1 % per halving from 20 to 160 elements,
// while the kept pairs' fall by 2.6, 1.3 and 0.6 %). At 30° they stay
// within 1 % per halving about 20 % below the kept pairs': a plateau that
// is not convergence. So on crossing networks the moment is a lower bound
// and a refinement study can mislead (see the README); a treatment of
// crossings that removes this should change these expectations.
func TestCrossingDetachmentLowersSlip(t *testing.T) {
	sums := func(angle float64, n int, detach float64) float64 {
		return crossingSlip(t, angle, n, ContactSettings{DetachRadius: detach})
	}
	lone := loneCrossingSlip()
	ns := []int{20, 40, 80, 160}
	for _, angle := range []float64{60, 30} {
		var kept, pinned []float64
		for _, n := range ns {
			kept, pinned = append(kept, sums(angle, n, 0)), append(pinned, sums(angle, n, 0.6))
		}
		t.Logf("%g°: slip × length of one fault, m² (lone crack %.5g): kept %.5g, detached %.5g", angle, lone, kept, pinned)
		for k := range ns {
			if !(pinned[k] < kept[k]) {
				t.Errorf("%g°, %d elements: detached %.5g m², not below the kept pairs' %.5g m²", angle, ns[k], pinned[k], kept[k])
			}
			if k < 2 {
				continue
			}
			// First order: each halving changes the kept sum by half as
			// much as the one before.
			if r := (kept[k] - kept[k-1]) / (kept[k-1] - kept[k-2]); !(r > 0.4 && r < 0.6) {
				t.Errorf("%g°, kept pairs, %d elements: ratio of successive changes %.3g, want about 0.5", angle, ns[k], r)
			}
			r := (pinned[k] - pinned[k-1]) / (pinned[k-1] - pinned[k-2])
			if angle == 60 && !(r > 0.7 && r < 1) {
				t.Errorf("60°, detached, %d elements: ratio of successive changes %.3g, want the slow rise seen (0.7–1)", ns[k], r)
			}
		}
		last := len(ns) - 1
		switch angle {
		case 60:
			if !(kept[last] > 1.1*lone) {
				t.Errorf("60°, kept pairs: %.5g m², want above the lone crack's %.5g m²", kept[last], lone)
			}
		case 30:
			for k := 1; k < len(ns); k++ {
				if math.Abs(pinned[k]/pinned[k-1]-1) > 0.01 || !(pinned[k] < 0.85*kept[k]) {
					t.Errorf("30°, detached, %d elements: %.5g m² (before %.5g; kept %.5g), want the plateau seen: within 1 %% per halving, over 15 %% below",
						ns[k], pinned[k], pinned[k-1], kept[k])
				}
			}
		}
	}
}

// crossingSlip returns the summed slip × length, m², of the first of two
// straight faults 20 m long crossing at their midpoints at angle degrees,
// n elements each, both past their constant strength by Δτ = 0.5 MPa, in
// plane strain, solved in one step with settings set (DetachRadius in
// element lengths; NearRadius and Tolerance are set here).
func crossingSlip(t *testing.T, angle float64, n int, set ContactSettings) float64 {
	t.Helper()
	const half, sigma, p0, tau = crossingHalf, crossingSigma, crossingP0, crossingTau
	var elems []elastic.Element
	var ce []ContactElement
	second := r2.Vec{X: math.Cos(angle * math.Pi / 180), Y: math.Sin(angle * math.Pi / 180)}
	for g, d := range []r2.Vec{{X: 1}, second} {
		for i := range n {
			a, b := -half+2*half*float64(i)/float64(n), -half+2*half*float64(i+1)/float64(n)
			e := elastic.Element{P0: r2.Scale(a, d), P1: r2.Scale(b, d), Height: 1}
			elems = append(elems, e)
			ce = append(ce, ContactElement{Element: e, Group: g, Shear: tau, Normal: sigma, Friction: crossingFriction})
		}
	}
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	h := 2 * half / float64(n)
	set.NearRadius, set.Tolerance = 4*half, 1e-10
	set.DetachRadius *= h
	c, err := NewContact(op, ce, set)
	if err != nil {
		t.Fatal(err)
	}
	c.Begin(c.NewState(), uniform(len(elems), p0))
	if _, err := c.Solve(uniform(len(elems), p0)); err != nil {
		t.Fatal(err)
	}
	var sum float64
	for i := range n { // the first fault
		sum += c.trial.ds[i] * h
	}
	return sum
}

// crossingFriction is the constant friction of crossingSlip's faults,
// and the constants their half-length, m, total normal stress, pressure
// and shear stress, Pa.
var crossingFriction = SlipWeakening{Static: 0.6, Residual: 0.6, CriticalSlip: 1e-3}

const crossingHalf, crossingSigma, crossingP0, crossingTau = 10.0, 50e6, 20e6, 18.5e6

// loneCrossingSlip is the slip × length of one of crossingSlip's faults
// alone, (1−ν)Δτπc²/G (Pollard & Segall 1987), m².
func loneCrossingSlip() float64 {
	overload := crossingTau - crossingFriction.Static*(crossingSigma-crossingP0)
	return (1 - testRock.PoissonRatio) * overload * math.Pi * crossingHalf * crossingHalf / testRock.ShearModulus
}

// Coupled crossings (CoupleCrossings) keep the pairs of an X, whose slip
// energy and friction stay well posed, in the closed-crossing mode the
// simulator uses (ShearOnly): the slip of each fault is then the kept
// pairs' (DetachRadius 0) to round-off and converges at first order in the
// element length (the ratio of successive changes about ½, as for a lone
// crack of constant elements; Crouch & Starfield 1983), where the
// detached crossing pins it (TestCrossingDetachmentLowersSlip). At 10°
// the check refuses the X (too compliant a mode with its neighbours, or
// friction not well posed in every direction of sliding) and the crossing
// is detached and compensated as without coupling: its slip is then 40 %
// below the kept pairs'.
func TestCoupledCrossingConverges(t *testing.T) {
	ns := []int{20, 40, 80, 160}
	for _, tc := range []struct {
		angle float64
		kept  bool
	}{{60, true}, {30, true}, {10, false}} {
		var coupled, kept, detached []float64
		for _, n := range ns {
			coupled = append(coupled, crossingSlip(t, tc.angle, n, ContactSettings{DetachRadius: 0.6, ShearOnly: true, CoupleCrossings: true}))
			kept = append(kept, crossingSlip(t, tc.angle, n, ContactSettings{ShearOnly: true}))
			detached = append(detached, crossingSlip(t, tc.angle, n, ContactSettings{DetachRadius: 0.6, ShearOnly: true}))
		}
		t.Logf("%g°: slip × length, m²: coupled %.5g, kept %.5g, detached %.5g", tc.angle, coupled, kept, detached)
		want := kept
		if !tc.kept {
			want = detached
		}
		for k := range ns {
			if math.Abs(coupled[k]-want[k]) > 1e-9*want[k] {
				t.Errorf("%g°, %d elements: coupled %.8g m², want %.8g (kept %v)", tc.angle, ns[k], coupled[k], want[k], tc.kept)
			}
			if k >= 2 && tc.kept {
				if r := (coupled[k] - coupled[k-1]) / (coupled[k-1] - coupled[k-2]); !(r > 0.4 && r < 0.6) {
					t.Errorf("%g°, %d elements: ratio of successive changes %.3g, want about 0.5", tc.angle, ns[k], r)
				}
			}
		}
	}
}
