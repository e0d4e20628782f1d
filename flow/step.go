package flow

import (
	"errors"
	"fmt"
	"math"
)

// ControlMode is what the well holds fixed.
type ControlMode int

const (
	// RateControl injects a total rate, switching to the pressure cap
	// while the bottom-hole pressure would exceed it. A rate of 0 is a
	// shut-in: the open clusters still exchange fluid through the well.
	RateControl ControlMode = iota
	// PressureControl holds the bottom-hole pressure.
	PressureControl
)

// Control is the well's instruction for one step.
type Control struct {
	Mode ControlMode
	// Rate is the total rate under rate control, m³/s.
	Rate float64
	// Pressure is the bottom-hole pressure under pressure control, Pa.
	Pressure float64
	// Cap is the bottom-hole pressure cap under rate control, Pa; 0 for
	// none.
	Cap float64
}

// State is the flow state at one time.
type State struct {
	// Time, s.
	Time float64
	// Pressure of every element, Pa.
	Pressure []float64
	// Aperture of every element at Pressure (hydraulic, m).
	Aperture []float64
	// Content of every element, m³ at the reference density.
	Content []float64
	// InitialContent is the content of every element in the state NewState
	// made, m³; leak-off never takes an element below it.
	InitialContent []float64
	// Exposed is the time each element started leaking off (Carter), s;
	// NaN while it has not.
	Exposed []float64
	// Matrix holds the pore pressures of the matrix cells beside every
	// element under matrix leak-off (Config.Matrix), Pa: the cells of
	// element i, from its face outwards, at [i·c, (i+1)·c) for c cells per
	// face (both faces alike); nil without matrix leak-off.
	Matrix []float64
	// BHP is the well's bottom-hole pressure, Pa.
	BHP float64
	// Capped tells that the last step ran at the pressure cap.
	Capped bool
}

// ApertureFunc sets e[i], the hydraulic aperture (m), and dedp[i], its
// derivative with respect to the element pressure (m/Pa), of every element
// at the pressures p. The flow solver does not know why apertures change;
// the caller (the coupled simulator) does.
type ApertureFunc func(p, e, dedp []float64)

// StepSettings end the Picard iterations of a step.
type StepSettings struct {
	// PressureTol: largest pressure change between iterations, Pa
	// (default 1 Pa).
	PressureTol float64
	// ApertureTol: largest relative aperture change between iterations
	// (default 1e-4).
	ApertureTol float64
	// MassTol: largest mass-balance error of the step relative to the
	// fluid moved in it (default 1e-10).
	MassTol float64
	// MaxIterations before the step fails (default 30).
	MaxIterations int
	// MaxIterationChange caps the pressure change of any element in one
	// Picard iteration, Pa (default: no cap). Where apertures jump with
	// pressure (slip, crack opening) a capped iteration approaches the
	// solution instead of overshooting into another branch.
	MaxIterationChange float64
	// Restart, when set, is called before the first iteration of every
	// attempt at the step: Step may solve under rate control, find the
	// pressure cap exceeded and solve again at the cap, and the caller's
	// aperture model must then forget what the discarded attempt did.
	Restart func()
}

func (s StepSettings) withDefaults() StepSettings {
	if s.PressureTol <= 0 {
		s.PressureTol = 1
	}
	if s.ApertureTol <= 0 {
		s.ApertureTol = 1e-4
	}
	if s.MassTol <= 0 {
		s.MassTol = 1e-10
	}
	if s.MaxIterations <= 0 {
		s.MaxIterations = 30
	}
	return s
}

// ErrStepNotConverged is returned when the Picard iterations of a step do
// not converge; a shorter step usually does.
var ErrStepNotConverged = errors.New("flow: step did not converge")

// exposureRise is the pressure rise above the reference at which an
// element starts to leak off (common practice, no source).
const exposureRise = 0.1e6

// StepResult describes an accepted step.
type StepResult struct {
	Iterations int
	// BHP at the end of the step, Pa.
	BHP float64
	// Rate into the network, m³/s, and whether the cap held the pressure.
	Rate   float64
	Capped bool
	// Injected, Leaked and Stored are the step's volumes, m³ at reference
	// density; MassError = Injected − Leaked − Stored, m³.
	Injected, Leaked, Stored, MassError float64
	// MaxChange is the largest element pressure change, Pa.
	MaxChange float64
}

// NewState returns the state with every element at pressure p0 (and the
// well too), with apertures and contents from ap.
func (s *System) NewState(p0 float64, ap ApertureFunc) *State {
	p := make([]float64, s.nElem)
	for i := range p {
		p[i] = p0
	}
	return s.NewStateAt(p, p0, ap)
}

// NewStateAt returns the state with element i at pressure p[i] (the matrix
// beside it too) and the well at bhp, with apertures and contents from ap.
// It keeps p.
func (s *System) NewStateAt(p []float64, bhp float64, ap ApertureFunc) *State {
	n := s.nElem
	if len(p) != n {
		panic("flow: NewStateAt: len(p) is not the number of elements")
	}
	st := &State{
		Pressure: p, Aperture: make([]float64, n),
		Content: make([]float64, n), InitialContent: make([]float64, n), Exposed: make([]float64, n), BHP: bhp,
	}
	dedp := make([]float64, n)
	for i := range st.Exposed {
		st.Exposed[i] = math.NaN()
	}
	ap(st.Pressure, st.Aperture, dedp)
	for i := range st.Content {
		st.Content[i] = s.Content(i, st.Aperture[i], p[i])
	}
	copy(st.InitialContent, st.Content)
	if s.mx != nil {
		st.Matrix = make([]float64, n*s.mx.n)
		for i := range st.Matrix {
			st.Matrix[i] = p[i/s.mx.n]
		}
	}
	return st
}

// Step advances cur by dt into next (backward Euler) under ctl, with
// apertures from ap. The nonlinear terms are handled by Picard iterations
// with lagged transmissibilities and linearised storage, so every linear
// system is symmetric positive definite:
//
//	(S/dt + A(T)) p^{k+1} = S/dt p^k − (m(p^k) − m^n)/dt − leak/dt + q
//
// with m_i = h_i L_i e_i (1 + c_f (p_i − p_ref)) the fluid content,
// S_i = ∂m_i/∂p_i its storage, A(T) the star–delta transmissibility
// Laplacian and q the well term. At convergence the contents satisfy the
// discrete mass balance exactly up to the tolerances.
func (s *System) Step(cur, next *State, dt float64, ctl Control, ap ApertureFunc, set StepSettings) (StepResult, error) {
	if !(dt > 0) {
		panic("flow: time step must be > 0")
	}
	set = set.withDefaults()
	if !s.HasWell() || ctl.Mode == PressureControl || ctl.Cap <= 0 {
		res, err := s.solve(s.newIteration(cur, next, dt, ctl), ap, set)
		next.Capped = false
		return res, err
	}
	capped := Control{Mode: PressureControl, Pressure: ctl.Cap}
	if !cur.Capped {
		res, err := s.solve(s.newIteration(cur, next, dt, ctl), ap, set)
		if err != nil || res.BHP <= ctl.Cap {
			next.Capped = false
			return res, err
		}
	} else {
		res, err := s.solve(s.newIteration(cur, next, dt, capped), ap, set)
		if err != nil || res.Rate <= ctl.Rate {
			res.Capped = err == nil
			next.Capped = res.Capped
			return res, err
		}
		// The network now takes more than the target rate below the cap.
		res, err = s.solve(s.newIteration(cur, next, dt, ctl), ap, set)
		if err != nil || res.BHP <= ctl.Cap {
			next.Capped = false
			return res, err
		}
	}
	res, err := s.solve(s.newIteration(cur, next, dt, capped), ap, set)
	res.Capped = err == nil
	next.Capped = res.Capped
	return res, err
}

// iteration is the state of the Picard iterations of one step under one
// control.
type iteration struct {
	// cur is the state at the start of the step and next the state being
	// solved for; dt is the step, s.
	cur, next *State
	dt        float64
	// ctl is the well's control; under PressureControl the bottom-hole
	// pressure is held at ctl.Pressure (a pressure cap is such a control).
	ctl Control
	// p is the pressure iterate (next.Pressure), Pa, and pw the
	// bottom-hole pressure iterate, Pa.
	p  []float64
	pw float64
	// e and dedp are the apertures (m) at p and their pressure derivatives
	// (m/Pa); ePrev are the apertures of the previous iterate, m.
	e, dedp, ePrev []float64
	// leak is each element's leak-off volume over the step, m³.
	leak []float64
}

// newIteration starts the iterations of a step from the pressures of cur,
// with the System's work arrays.
func (s *System) newIteration(cur, next *State, dt float64, ctl Control) *iteration {
	if s.e == nil {
		n := s.nElem
		s.e, s.dedp, s.ePrev, s.leak = make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	}
	copy(next.Pressure, cur.Pressure)
	leak := s.leak
	if s.mx != nil {
		s.mx.prepare(s.mesh, cur, next, dt)
	} else {
		s.leakoff(cur, dt)
	}
	return &iteration{cur: cur, next: next, dt: dt, ctl: ctl, p: next.Pressure, pw: cur.BHP,
		e: s.e, dedp: s.dedp, ePrev: s.ePrev, leak: leak}
}

// leakSlope returns ∂leak_i/∂p_i of element i over the step, m³/Pa: a_i
// under matrix leak-off, 0 under Carter's (computed from the step's start).
func (s *System) leakSlope(i int) float64 {
	if s.mx == nil {
		return 0
	}
	return s.mx.a[i]
}

// updateLeak sets the matrix leak-off of every element at the pressures
// p, m³ over the step (Carter's is fixed for the step).
func (s *System) updateLeak(leak, p []float64) {
	if s.mx == nil {
		return
	}
	for i, pi := range p {
		leak[i] = s.mx.leak(i, pi)
	}
}

// holdsPressure reports whether the iteration holds the bottom-hole
// pressure (pressure control with a well).
func (s *System) holdsPressure(ctl Control) bool { return s.HasWell() && ctl.Mode == PressureControl }

// solve runs the Picard iterations of one step under one control.
func (s *System) solve(it *iteration, ap ApertureFunc, set StepSettings) (StepResult, error) {
	if set.Restart != nil {
		set.Restart()
	}
	n := s.nElem
	cur, next, p := it.cur, it.next, it.p
	var res StepResult
	var dp float64
	for k := 0; ; k++ {
		ap(p, it.e, it.dedp)
		s.updateLeak(it.leak, p)
		if k > 0 {
			res.Stored, res.MassError = s.balance(cur, p, it.e, res.Injected, it.leak)
			if dp <= set.PressureTol && relChange(it.e, it.ePrev) <= set.ApertureTol &&
				math.Abs(res.MassError) <= s.massTolerance(set.MassTol, res.Injected, it.leak, res.Stored, cur.Content) {
				res.Iterations = k
				break
			}
		}
		if k == set.MaxIterations {
			return res, fmt.Errorf("%w in %d iterations at t = %.6g s (dt = %.3g s)", ErrStepNotConverged, k, cur.Time, it.dt)
		}
		copy(it.ePrev, it.e)
		if err := s.linearSolve(it); err != nil {
			return res, err
		}
		s.relax(s.sol, k, set.MaxIterationChange)
		dp = maxAbsDiff(s.sol[:n], p)
		copy(p, s.sol[:n])
		it.pw = s.bhp(it.ctl)
		res.Rate = s.wellRate(p, it.pw)
		res.Injected = res.Rate * it.dt
	}
	res.BHP, res.Leaked = it.pw, total(it.leak)
	res.MaxChange = maxAbsDiff(p, cur.Pressure)
	next.Time, next.BHP = cur.Time+it.dt, it.pw
	copy(next.Aperture, it.e)
	if s.mx != nil {
		s.mx.finish(next, p)
	}
	for i := range n {
		next.Content[i] = s.Content(i, it.e[i], p[i])
		next.Exposed[i] = cur.Exposed[i]
		if math.IsNaN(next.Exposed[i]) && p[i] > s.cfg.ReferencePressure+exposureRise {
			next.Exposed[i] = next.Time
		}
	}
	return res, nil
}

// linearSolve assembles one Picard iteration and solves it for the
// increment s.delta from the iterate s.sol = [p; p_w].
func (s *System) linearSolve(it *iteration) error {
	s.as.Reset()
	clear(s.rhs)
	s.quantum, s.wellQuantum = 0, 0
	s.conductances(it.e)
	s.sumClusters()
	s.updatePerforations(it.p, it.pw)
	cf, pref := s.cfg.Fluid.Compressibility, s.cfg.ReferencePressure
	p, e, dt := it.p, it.e, it.dt
	x := s.sol
	copy(x, p)
	if s.HasWell() {
		x[s.nElem] = it.pw
	}
	for i := range s.nElem {
		el := &s.mesh.Elements[i]
		hl := el.Height * el.Length
		storage := hl * (it.dedp[i]*(1+cf*(p[i]-pref)) + e[i]*cf)
		s.quantum += storage * ulp(p[i])
		content := hl * e[i] * (1 + cf*(p[i]-pref))
		// Matrix leak-off is linear in p_i: its slope joins the diagonal.
		slope := s.leakSlope(i)
		s.as.AddDiagonal(i, (storage+slope)/dt)
		s.rhs[i] = -((content - it.cur.Content[i]) + it.leak[i]) / dt
	}
	s.assembleFlux(it.ctl, it.e)
	s.wellInflow(s.rhs, it.ctl, x)
	for c, k := range s.wellEl {
		s.wellQuantum += s.wellConductance(c) * dt * (ulp(p[k]) + ulp(it.pw))
	}
	if err := s.ls.Factor(s.as.Matrix()); err != nil {
		return err
	}
	// Solve for the increment from the current iterate, A δ = b − A x,
	// so the solver's relative tolerance applies to the residual of the
	// mass balance rather than to the large storage terms S/dt·p. The
	// residual is summed in flux form, t (x_j − x_i) per connection: as
	// b − A x its terms of size t·p would cancel, leaving round-off far
	// above what the pressures resolve where conductances are large.
	s.as.Residual(s.res, s.rhs, x)
	_, err := s.ls.Solve(s.delta, s.res)
	return err
}

// relax moves the iterate x by ω δ with Aitken's dynamic relaxation
// (Irons & Tuck 1969; as used for partitioned coupling by Küttler & Wall
// 2008, Comput. Mech. 43, 61–72): ω_k = −ω_{k−1} δ_{k−1}·(δ_k − δ_{k−1}) /
// |δ_k − δ_{k−1}|², kept within [0.05, 1]. Lagged transmissibilities make
// the plain iteration overshoot and alternate where apertures are very
// sensitive to pressure; the relaxation damps that and restores fast
// convergence. ω = 1 on the first iteration of a step. The step ω δ is
// then shortened, if needed, so no element moves by more than maxChange.
func (s *System) relax(x []float64, it int, maxChange float64) {
	if it == 0 {
		s.omega = 1
	} else {
		var num, den float64
		for i, d := range s.delta {
			diff := d - s.prevDelta[i]
			num += s.prevDelta[i] * diff
			den += diff * diff
		}
		if den > 0 {
			s.omega = math.Min(1, math.Max(0.05, -s.omega*num/den))
		}
	}
	copy(s.prevDelta, s.delta)
	w := s.omega
	if maxChange > 0 {
		if big := maxAbs(s.delta) * w; big > maxChange {
			w *= maxChange / big
		}
	}
	for i := range x {
		x[i] += w * s.delta[i]
	}
}

// ulp returns the unit in the last place of x.
func ulp(x float64) float64 {
	x = math.Abs(x)
	return math.Nextafter(x, math.Inf(1)) - x
}

// maxAbs returns max |v_i|.
func maxAbs(v []float64) float64 {
	var m float64
	for _, x := range v {
		m = max(m, math.Abs(x))
	}
	return m
}

// bhp returns the bottom-hole pressure after a solve.
func (s *System) bhp(ctl Control) float64 {
	switch {
	case !s.HasWell():
		return math.NaN()
	case s.holdsPressure(ctl):
		return ctl.Pressure
	}
	return s.sol[s.nElem]
}

// balance returns the stored volume change of the step and the mass error
// Injected − Leaked − Stored, m³.
func (s *System) balance(cur *State, p, e []float64, injected float64, leak []float64) (stored, massErr float64) {
	for i := range s.nElem {
		stored += s.Content(i, e[i], p[i]) - cur.Content[i]
	}
	return stored, injected - total(leak) - stored
}

// massTolerance is the largest acceptable mass error of a step, m³: rel
// times the volume moved in the step, but not below the round-off of
// summing the n contents, max(n, 256)·ε·Σ m (the bound of recursive summation;
// Higham 2002, Accuracy and Stability of Numerical Algorithms, §4.2),
// which governs during shut-in, nor below what the pressures can resolve:
// an element's pressure moves by whole units of its last place, ulp(p),
// and its content by its storage times that, so the contents cannot be
// balanced more finely than Σ S_i·ulp(p_i) (s.quantum, from the last
// assembly; times 16 for the iterations' round-off). That floor governs
// where fractures are open wide and compliant at tens of MPa. Nor can the
// well's inflow be balanced more finely than Σ T_kw·dt·(ulp(p_k) +
// ulp(p_w)) (s.wellQuantum), the change of each connection's flow when its
// pressures move by their last place, which governs where a wide fracture
// meets the well through a short element.
func (s *System) massTolerance(rel, injected float64, leak []float64, stored float64, content []float64) float64 {
	moved := math.Max(math.Max(math.Abs(injected), math.Abs(total(leak))), math.Abs(stored))
	return math.Max(rel*moved, math.Max(float64(max(len(content), 256))*epsilon*total(content), 16*s.quantum+s.wellQuantum))
}

// epsilon is the float64 machine epsilon.
const epsilon = 0x1p-52

// leakoff sets s.leak to each element's Carter leak-off volume over the step,
// from both faces: 2·h·L · 2 C_L (√(t+dt−t₀) − √(t−t₀)) (Carter 1957, in
// Howard & Fast, Drilling and Production Practice, API), computed from the
// state at the start of the step (so the system stays symmetric) and
// limited to the element's fluid above its initial content (so an element
// that cannot take more from its neighbours does not drain below it).
func (s *System) leakoff(cur *State, dt float64) {
	leak := s.leak
	cl := s.cfg.Fluid.Leakoff
	for i := range leak {
		leak[i] = 0
		t0 := cur.Exposed[i]
		if cl == 0 || math.IsNaN(t0) || cur.Pressure[i] <= s.cfg.ReferencePressure {
			continue
		}
		el := &s.mesh.Elements[i]
		v := 4 * el.Height * el.Length * cl * (math.Sqrt(cur.Time+dt-t0) - math.Sqrt(cur.Time-t0))
		leak[i] = math.Max(0, math.Min(v, cur.Content[i]-cur.InitialContent[i]))
	}
}

// relChange returns max |a_i − b_i| / |b_i|.
func relChange(a, b []float64) float64 {
	var d float64
	for i := range a {
		d = max(d, math.Abs(a[i]-b[i])/math.Abs(b[i]))
	}
	return d
}

func total(v []float64) float64 {
	var t float64
	for _, x := range v {
		t += x
	}
	return t
}

// ErrStepTooSmall is returned by StepSize.Cut when the step would fall
// below its minimum.
var ErrStepTooSmall = errors.New("flow: time step below the minimum")

// StepSize adapts the time step: it grows after easy steps, in proportion
// to how far the largest pressure change stayed below the target, and is
// halved after a failed or rejected step.
type StepSize struct {
	// Dt is the next step, Min and Max its limits, s.
	Dt, Min, Max float64
	// MaxChange is the target largest pressure change per step, Pa.
	MaxChange float64
	// hold counts the accepted steps after a cut during which Dt does not
	// grow, so a step that just failed is not retried at once.
	hold int
}

// holdAfterCut is the number of steps Dt stays put after a cut (common
// practice, no source).
const holdAfterCut = 3

// Accept adapts Dt after a step whose largest pressure change was change:
// Dt × min(2, 0.8·MaxChange/change), within [Min, Max], without growing in
// the few steps after a cut.
func (z *StepSize) Accept(change float64) {
	f := 2.0
	if change > 0 {
		f = math.Min(f, 0.8*z.MaxChange/change)
	}
	if z.hold > 0 {
		z.hold--
		f = math.Min(f, 1)
	}
	z.Dt = math.Min(z.Max, math.Max(z.Min, z.Dt*math.Max(f, 0.25)))
}

// Cut halves Dt; it fails when Dt is already at the minimum.
func (z *StepSize) Cut() error {
	if z.Dt <= z.Min {
		return fmt.Errorf("%w (%g s)", ErrStepTooSmall, z.Min)
	}
	z.Dt = math.Max(z.Min, z.Dt/2)
	z.hold = holdAfterCut
	return nil
}

// Refresh recomputes the contents of st from its pressures and apertures
// with this system's fluid, e.g. when a stage pumps a fluid of another
// compressibility than the last.
func (s *System) Refresh(st *State) {
	for i := range st.Content {
		st.Content[i] = s.Content(i, st.Aperture[i], st.Pressure[i])
	}
}
