package mechanics

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
	"slipfront/internal/numtest"
)

// Test rock: G = 30 GPa, ν = 0.25 (the material of docs/references.md
// §9.2's Sneddon table).
var testRock = elastic.Material{ShearModulus: 30e9, PoissonRatio: 0.25}

// straightFault returns n equal elements along x from −half to half, in
// plane strain (the operator's height correction off, so the closed forms
// of 2-D cracks apply), as one group with the given in-situ tractions.
func straightFault(t *testing.T, n int, half float64, shear, normal float64, f SlipWeakening) (*Contact, []elastic.Element) {
	t.Helper()
	elems := make([]elastic.Element, n)
	ce := make([]ContactElement, n)
	for i := range n {
		x0 := -half + 2*half*float64(i)/float64(n)
		x1 := -half + 2*half*float64(i+1)/float64(n)
		elems[i] = elastic.Element{P0: r2.Vec{X: x0}, P1: r2.Vec{X: x1}, Height: 1}
		ce[i] = ContactElement{Element: elems[i], Shear: shear, Normal: normal, Friction: f}
	}
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	c, err := NewContact(op, ce, ContactSettings{NearRadius: 4 * half, Tolerance: 1e-10})
	if err != nil {
		t.Fatal(err)
	}
	return c, elems
}

func uniform(n int, v float64) []float64 {
	p := make([]float64, n)
	for i := range p {
		p[i] = v
	}
	return p
}

// A crack whose fluid pressure exceeds its normal stress everywhere opens
// as the elastic solution of K_nn w = p − σn; its opening follows Sneddon
// (1946): w = 2(1−ν)(Δp/G)√(c² − x²), within the constant-element error of
// docs/references.md §9.2 (interior ratio ≈ 1 + 0.5/N; excluding two tip
// elements at each end, |w/w_an − 1| < 0.11).
func TestContactPressurisedCrack(t *testing.T) {
	const n, c0, sigma, dp = 40, 1.0, 20e6, 1e6
	f := SlipWeakening{Static: 0.6, Residual: 0.6, CriticalSlip: 1e-3}
	c, elems := straightFault(t, n, c0, 0, sigma, f)
	st := c.NewState()
	p := uniform(n, sigma+dp)
	c.Begin(st, uniform(n, 0))
	res, err := c.Solve(p)
	if err != nil {
		t.Fatal(err)
	}
	if res.Active != n {
		t.Fatalf("%d elements active, want all %d open", res.Active, n)
	}
	for i, e := range elems {
		x := e.Centre().X
		_, _, w, _, dwdp := c.Aperture(i)
		want := 2 * (1 - testRock.PoissonRatio) * dp / testRock.ShearModulus * math.Sqrt(c0*c0-x*x)
		if i >= 2 && i < n-2 && math.Abs(w/want-1) > 0.11 {
			t.Errorf("element %d: opening %.6g m, Sneddon %.6g m", i, w, want)
		}
		// The opening is linear in the net pressure: ∂w/∂p = w/Δp.
		numtest.Rel(t, "∂w/∂p", dwdp, w/dp, 1e-9)
	}
	// The centre element (x = c/N) against §9.2's table for N = 40: w =
	// 5.0613428129e−5 m at Δp = 1 MPa (the same formulation: to 1e−8).
	_, _, w, _, _ := c.Aperture(n / 2)
	numtest.Rel(t, "opening at x = c/N", w, 5.0613428129e-5, 1e-8)
	c.Commit(testRock.ShearModulus, nil)
	if st.Opening[n/2] != w || st.Normal[n/2] > sigma+dp+1 || st.Normal[n/2] < sigma+dp-1 {
		t.Errorf("committed opening %g m, normal stress %g Pa; want %g m and the fluid pressure", st.Opening[n/2], st.Normal[n/2], w)
	}
}

// With ShearOnly, a crack whose fluid pressure exceeds its normal stress
// stays closed and loses all its shear strength (no cohesion): it slips by
// the elliptical profile of a stress drop equal to the whole in-situ shear
// traction (Pollard & Segall 1987, as in TestContactStressDrop).
func TestContactShearOnly(t *testing.T) {
	const n, c0, sigma, tau = 40, 1.0, 20e6, 2e6
	f := SlipWeakening{Static: 0.6, Residual: 0.6, CriticalSlip: 1e-3}
	c, elems := straightFault(t, n, c0, tau, sigma, f)
	c.set.ShearOnly = true
	st := c.NewState()
	c.Begin(st, uniform(n, 0))
	if _, err := c.Solve(uniform(n, sigma+1e6)); err != nil {
		t.Fatal(err)
	}
	for i, e := range elems {
		_, _, w, _, _ := c.Aperture(i)
		if w != 0 {
			t.Fatalf("element %d opened by %g m with ShearOnly", i, w)
		}
		x := e.Centre().X
		want := 2 * (1 - testRock.PoissonRatio) * tau / testRock.ShearModulus * math.Sqrt(c0*c0-x*x)
		if got := c.trial.ds[i]; i >= 2 && i < n-2 && math.Abs(got/want-1) > 0.11 {
			t.Errorf("element %d slip %.6g m, elliptical profile %.6g m", i, got, want)
		}
	}
}

// Below its strength nothing slips or opens; above it, a fault of
// constant friction slips by the elliptical profile of a uniform stress
// drop Δτ = τ − μσn′ (Pollard & Segall 1987: s = 2(1−ν)(Δτ/G)√(c² − x²),
// the same as the opening of a pressurised crack, docs/references.md §9.2
// test (c)), and the slip relaxes the shear stress to the strength.
func TestContactStressDrop(t *testing.T) {
	const n, c0, sigma, p0 = 40, 1.0, 50e6, 20e6
	f := SlipWeakening{Static: 0.5, Residual: 0.5, CriticalSlip: 1e-3}
	strength := f.Static * (sigma - p0)
	for _, tc := range []struct {
		name string
		tau  float64
	}{{"stuck", strength - 1e5}, {"slips", strength + 1e6}, {"slips left-lateral", -(strength + 1e6)}} {
		c, elems := straightFault(t, n, c0, tc.tau, sigma, f)
		st := c.NewState()
		c.Begin(st, uniform(n, p0))
		res, err := c.Solve(uniform(n, p0))
		if err != nil {
			t.Fatal(err)
		}
		drop := math.Abs(tc.tau) - strength
		if drop < 0 {
			if res.Active != 0 || res.MaxSlip != 0 {
				t.Errorf("%s: %d elements active, slip %g m below the strength", tc.name, res.Active, res.MaxSlip)
			}
			continue
		}
		for i, e := range elems {
			x := e.Centre().X
			want := sign(tc.tau) * 2 * (1 - testRock.PoissonRatio) * drop / testRock.ShearModulus * math.Sqrt(c0*c0-x*x)
			got := c.trial.ds[i]
			if i >= 2 && i < n-2 && math.Abs(got/want-1) > 0.11 {
				t.Errorf("%s: element %d slip %.6g m, elliptical profile %.6g m", tc.name, i, got, want)
			}
		}
		slip := c.Commit(testRock.ShearModulus, nil)
		if len(slip.Ruptures) != 0 || slip.SeismicMoment != 0 || !(slip.AseismicMoment > 0) {
			t.Errorf("%s: constant friction gave %d ruptures, seismic %g, aseismic %g N·m; want stable slip only",
				tc.name, len(slip.Ruptures), slip.SeismicMoment, slip.AseismicMoment)
		}
		for i := range n {
			numtest.Rel(t, "shear after slip", math.Abs(st.Shear[i]), strength, 1e-7)
		}
	}
}

// A slip-weakening fault loaded by a growing, localized shear stress slips
// stably over a patch that grows until it reaches the nucleation length;
// then it ruptures, whatever the loading (Uenishi & Rice 2003: half-length
// a_n = 0.579·μ*/W, μ* = G/(1−ν) for in-plane slip, W = (μs − μd)σn′/Dc;
// the constant as computed in friction_test.go). The last stable patch's
// half-length must lie within a few elements of a_n.
func TestContactNucleation(t *testing.T) {
	const (
		n       = 400
		half    = 100.0 // m: elements of 0.5 m
		sigmaE  = 20e6  // σn′, Pa
		dc      = 2e-3  // m
		spread  = 5.0   // m, width of the load
		perStep = 2e3   // Pa of peak load per step
	)
	f := SlipWeakening{Static: 0.6, Residual: 0.5, CriticalSlip: dc}
	w := f.WeakeningRate(sigmaE)
	an := NucleationHalfLength(EffectiveShearModulus(testRock.ShearModulus, testRock.PoissonRatio, InPlane), w)
	// W = 0.1·20e6/2e-3 = 1e9 Pa/m, μ* = 40 GPa: a_n = 0.579·40e9/1e9 ≈
	// 23 m, 46 elements of 0.5 m.
	tau0 := f.Static*sigmaE - 0.2e6 // 0.2 MPa below the peak strength
	c, elems := straightFault(t, n, half, tau0, sigmaE, f)
	st := c.NewState()
	p := uniform(n, 0)
	stable := 0.0
	for step := 1; step <= 400; step++ {
		for i, e := range elems {
			x := e.Centre().X
			st.Shear[i] += perStep * math.Exp(-x*x/(spread*spread))
		}
		c.Begin(st, p)
		if _, err := c.Solve(p); err != nil {
			t.Fatalf("step %d: %v", step, err)
		}
		var lo, hi = math.Inf(1), math.Inf(-1)
		for i, e := range elems {
			if c.Slipping(i) && !c.trial.ruptured[i] {
				lo, hi = math.Min(lo, e.P0.X), math.Max(hi, e.P1.X)
			}
		}
		slip := c.Commit(testRock.ShearModulus, nil)
		if len(slip.Ruptures) > 0 {
			if stable == 0 {
				t.Fatalf("ruptured at step %d before any stable slip", step)
			}
			// Load steps move the patch by under an element here; the
			// constant elements resolve a_n to about an element.
			t.Logf("last stable half-length %.3f m, a_n %.3f m (Uenishi & Rice 2003), rupture at step %d", stable, an, step)
			numtest.Abs(t, "half-length of the last stable patch, m", stable, an, 3*2*half/n)
			r := slip.Ruptures[0]
			if len(r.Elements) < int(2*an/(2*half/n)) || !(r.Fraction >= 0 && r.Fraction <= 1) {
				t.Errorf("rupture of %d elements (fraction %g), want at least the nucleation patch", len(r.Elements), r.Fraction)
			}
			if !(slip.SeismicMoment > 0) {
				t.Errorf("rupture without seismic moment")
			}
			return
		}
		if hi > lo {
			stable = (hi - lo) / 2
		}
	}
	t.Fatalf("no rupture after 400 load steps (last stable half-length %g m, a_n %g m)", stable, an)
}

// The contact solution equals the direct solve of the same linear system
// when every element slides at constant friction and interacts with every
// other: a check of the Gauss–Seidel sweeps across two groups, and of the
// solve of the whole working set that takes over when the sweeps do not
// settle (forced here by allowing a single sweep), also when a step is
// repeated with the whole set's matrix kept.
func TestContactTwoGroups(t *testing.T) {
	const sigma, p0 = 40e6, 10e6
	f := SlipWeakening{Static: 0.4, Residual: 0.4, CriticalSlip: 1e-3}
	var elems []elastic.Element
	var ce []ContactElement
	for g, y := range []float64{0, 0.8} { // two parallel faults 0.8 m apart
		for i := range 10 {
			e := elastic.Element{P0: r2.Vec{X: -1 + 0.2*float64(i) + 0.1*float64(g), Y: y}, P1: r2.Vec{X: -0.8 + 0.2*float64(i) + 0.1*float64(g), Y: y}, Height: 1}
			elems = append(elems, e)
			ce = append(ce, ContactElement{Element: e, Group: g, Shear: 14e6, Normal: sigma, Friction: f})
		}
	}
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	// Direct: every element slides right-lateral at constant friction, so
	// (K_ss − μ K_ns) Δs = −(τ0 − μ(σ0 − p)), openings zero.
	n := len(elems)
	a := mat.NewDense(n, n, nil)
	b := mat.NewVecDense(n, nil)
	for i := range n {
		for j := range n {
			blk := op.At(i, j)
			a.Set(i, j, blk.ShearSlip-f.Static*blk.NormalSlip)
		}
		b.SetVec(i, -(14e6 - f.Static*(sigma-p0)))
	}
	var want mat.VecDense
	if err := want.SolveVec(a, b); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name   string
		sweeps int // ContactSettings.MaxIterations
		merged bool
	}{
		{"block Gauss–Seidel", 0, false},
		{"whole working set after one sweep", 1, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			ct, err := NewContact(op, ce, ContactSettings{NearRadius: 100, Tolerance: 1e-12, MaxIterations: c.sweeps})
			if err != nil {
				t.Fatal(err)
			}
			st := ct.NewState()
			p := uniform(len(elems), p0)
			ct.Begin(st, p)
			res, err := ct.Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			if max := ct.set.MaxIterations; c.merged != (res.Sweeps > max) || res.Sweeps < 2 {
				t.Errorf("%d sweeps (at most %d of Gauss–Seidel): want the whole set solved = %v", res.Sweeps, max, c.merged)
			}
			for i := range n {
				numtest.Rel(t, "slip against the direct solve", ct.trial.ds[i], want.AtVec(i), 1e-8)
			}
			if !c.merged {
				return
			}
			// The step repeated (as after a rejected step): the whole set
			// is solved again with the matrix kept from the first solve.
			if ct.caches[mergedGroup] == nil {
				t.Fatal("the whole working set's matrix was not kept")
			}
			ct.Begin(st, p)
			if res, err = ct.Solve(p); err != nil {
				t.Fatal(err)
			}
			if res.Sweeps <= ct.set.MaxIterations {
				t.Errorf("repeated step: %d sweeps, want the whole set solved again", res.Sweeps)
			}
			for i := range n {
				numtest.Rel(t, "slip of the repeated step against the direct solve", ct.trial.ds[i], want.AtVec(i), 1e-8)
			}
		})
	}
}

// Misuse and bad settings.
func TestContactErrors(t *testing.T) {
	e := elastic.Element{P0: r2.Vec{}, P1: r2.Vec{X: 1}, Height: 1}
	op, err := elastic.NewDense([]elastic.Element{e}, testRock, elastic.Settings{})
	if err != nil {
		t.Fatal(err)
	}
	good := SlipWeakening{Static: 0.6, Residual: 0.5, CriticalSlip: 1e-3}
	for _, tc := range []struct {
		name string
		el   ContactElement
		set  ContactSettings
	}{
		{"no radius", ContactElement{Element: e, Friction: good}, ContactSettings{}},
		{"bad friction", ContactElement{Element: e, Friction: SlipWeakening{Static: 0.5, Residual: 0.6, CriticalSlip: 1e-3}}, ContactSettings{NearRadius: 1}},
		{"negative group", ContactElement{Element: e, Group: -1, Friction: good}, ContactSettings{NearRadius: 1}},
	} {
		var ie *InputError
		if _, err := NewContact(op, []ContactElement{tc.el}, tc.set); !errors.As(err, &ie) {
			t.Errorf("%s: error %v, want *InputError", tc.name, err)
		}
	}
}

// A fault of constant friction under the pressure of a line source held
// at Δp over p0 since t = 0, p = p0 + Δp·erfc(|x|/ℓ) with ℓ = √(4αt),
// slips over |x| < a where the stress intensity at the front vanishes,
//
//	T = (μσn′ − τ0)/(μΔp) = (2/π) ∫₀^{π/2} erfc(λ sin θ) dθ,  a = λℓ,
//
// the criterion of Bhattacharya & Viesca (2019) and Viesca (2021, eq. 2.9
// with K = 0) for a plane-strain fault. The slip front then runs ahead of
// the Coulomb front x_c = ℓ·erfc⁻¹(T), the more so the smaller T. The
// elastic solution must find a within an element or two.
func TestContactSlipFrontCriterion(t *testing.T) {
	const sigma, p0, dp, mu = 50e6, 20e6, 10e6, 0.6
	const n, half = 400, 4.0 // elements over |x| < 4ℓ, ℓ = 1 m
	for _, T := range []float64{0.2, 0.5, 0.8} {
		tau := mu*(sigma-p0) - T*mu*dp
		f := SlipWeakening{Static: mu, Residual: mu, CriticalSlip: 1}
		c, elems := straightFault(t, n, half, tau, sigma, f)
		p := make([]float64, n)
		for i, e := range elems {
			p[i] = p0 + dp*math.Erfc(math.Abs(e.Centre().X))
		}
		st := c.NewState()
		c.Begin(st, uniform(n, p0))
		if _, err := c.Solve(p); err != nil {
			t.Fatal(err)
		}
		var front float64
		for i, e := range elems {
			if c.trial.ds[i] != 0 {
				front = math.Max(front, math.Abs(e.Centre().X))
			}
		}
		lambda := SlipFrontFactor(T)
		dx := 2 * half / n
		t.Logf("T = %.1f: slip front %.3f m, criterion λℓ = %.3f m", T, front, lambda)
		if math.Abs(front-lambda) > 2*dx {
			t.Errorf("T = %.1f: slip front %.4f m, criterion %.4f m (element %.3f m)", T, front, lambda, dx)
		}
	}
}

// SlipFrontFactor against values computed independently with SciPy
// (quad and brentq to 1e-12; testdata/slip-front-plane-strain's
// reference.json): λ(0.67548094716667) = 0.474235516031227; and the
// limits: no slip at T → 1, a front far ahead as T → 0.
func TestSlipFrontFactor(t *testing.T) {
	numtest.Rel(t, "λ(0.6755)", SlipFrontFactor(0.6754809471666666), 0.474235516031227, 1e-6)
	if l := SlipFrontFactor(0.999); !(l > 0 && l < 0.01) {
		t.Errorf("λ(0.999) = %g, want a front close to the source", l)
	}
	if l := SlipFrontFactor(0.01); !(l > 10) {
		t.Errorf("λ(0.01) = %g, want a front far ahead of the diffusion length", l)
	}
	for _, T := range []float64{0, 1, -1, math.NaN()} {
		if l := SlipFrontFactor(T); !math.IsNaN(l) {
			t.Errorf("λ(%g) = %g, want NaN", T, l)
		}
	}
}

// When the whole working set is solved as one system, instability is still
// judged trace by trace: with every element of a long slip-weakening fault
// (group 0, 80 m, four nucleation half-lengths) and of a far fault of
// constant friction (group 1) sliding, the unstable patch is group 0's
// sliding elements alone, not the stable fault's too (Uenishi & Rice 2003
// for the first; a fault that does not weaken cannot become unstable).
func TestContactStabilityByGroup(t *testing.T) {
	const sigmaE = 20e6
	weak := SlipWeakening{Static: 0.6, Residual: 0.5, CriticalSlip: 2e-3} // a_n ≈ 23 m
	steady := SlipWeakening{Static: 0.4, Residual: 0.4, CriticalSlip: 2e-3}
	var elems []elastic.Element
	var ce []ContactElement
	for g, fault := range []struct {
		y, half float64
		n       int
		f       SlipWeakening
	}{{0, 40, 80, weak}, {300, 10, 20, steady}} {
		for i := range fault.n {
			x0 := -fault.half + 2*fault.half*float64(i)/float64(fault.n)
			x1 := -fault.half + 2*fault.half*float64(i+1)/float64(fault.n)
			e := elastic.Element{P0: r2.Vec{X: x0, Y: fault.y}, P1: r2.Vec{X: x1, Y: fault.y}, Height: 1}
			elems = append(elems, e)
			ce = append(ce, ContactElement{Element: e, Group: g, Shear: fault.f.Static*sigmaE + 1e5, Normal: sigmaE, Friction: fault.f})
		}
	}
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	c, err := NewContact(op, ce, ContactSettings{NearRadius: 1000, Tolerance: 1e-10})
	if err != nil {
		t.Fatal(err)
	}
	c.Begin(c.NewState(), uniform(len(elems), 0))
	s, _ := allSliding(c)
	lambda, patch := s.stability()
	if !(lambda < 0) {
		t.Fatalf("smallest eigenvalue %g: the 80 m weakening fault should be unstable", lambda)
	}
	if len(patch) != 80 {
		t.Errorf("unstable patch of %d elements, want the weakening fault's 80", len(patch))
	}
	for _, k := range patch {
		if g := ce[s.elems[k]].Group; g != 0 {
			t.Fatalf("the unstable patch holds element %d of group %d, the fault of constant friction", s.elems[k], g)
		}
	}
}

// allSliding returns the system of the whole working set of c, every
// element sliding right-lateral at no slip yet, with its Jacobian and
// slopes evaluated, and the elements' local indices (all of them).
func allSliding(c *Contact) (*groupSystem, []int) {
	all := make([]int, len(c.elems))
	for i := range all {
		all[i] = i
		c.trial.status[i], c.trial.sign[i] = sliding, 1
	}
	s := c.newGroupSystem(mergedGroup, all)
	s.fix()
	s.residual()
	return s, all
}

// A Newton solve that stops without converging, in the round whose
// statuses hold, is accepted only when its last step is within the contact
// tolerance; otherwise the solve fails (and the simulator cuts the step)
// instead of passing a wrong slip on.
func TestContactNewtonStall(t *testing.T) {
	c := &Contact{set: ContactSettings{Tolerance: 1e-6}}
	s := &groupSystem{c: c, group: 3}
	for _, tc := range []struct {
		step, zmax float64
		ok         bool
	}{
		{1e-9, 1e-2, true},   // within 1e-6 of the largest increment
		{1e-13, 0, true},     // below the absolute tolerance
		{1e-7, 1e-2, false},  // 1e-5 of it
		{7.9e3, 341, false},  // a diverging step (seen before crossings were compensated)
		{1e-12, 1e-12, true}, // round-off of a tiny increment
	} {
		err := s.stalled(tc.step, tc.zmax)
		if (err == nil) != tc.ok || err != nil && !errors.Is(err, ErrContactNotConverged) {
			t.Errorf("stalled(%g, %g) = %v, want ok = %v", tc.step, tc.zmax, err, tc.ok)
		}
	}
}
