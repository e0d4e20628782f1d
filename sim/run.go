package sim

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"

	"slipfront/dfn"
	"slipfront/flow"
	"slipfront/internal/badinput"
	"slipfront/mechanics"
	"slipfront/scenarios"
	"slipfront/snapshot"
)

// Options control a run.
type Options struct {
	// Begin, when set, is called once the mesh is built, before the first
	// frame, with the elements (e.g. to write a snapshot header); with
	// path passes, once for each pass, whose frames replace those of the
	// pass before.
	Begin func(elements []Element) error
	// Frame, when set, receives the state at the end of the first time
	// step at or after every output time (k·numerics.output_interval) and
	// at the end; the slices are valid only during the call.
	Frame func(*Frame) error
	// Progress, when set, is called after every accepted step with the
	// simulated time and the schedule's nominal end, s.
	Progress func(t, end float64)
	// MemoryLimit, when > 0, is the memory the run may take, bytes: a mesh
	// that would need more is refused before the elastic operator is built.
	MemoryLimit float64
}

// Frame is the state of every element at the end of one time step.
type Frame struct {
	Time  float64
	Stage int
	// Pressure, Pa; Aperture, m; Slip, m; CoulombChange, Pa (see
	// Result.CoulombChange); Flags as snapshot.Flag*.
	Pressure, Aperture, Slip, CoulombChange []float64
	Flags                                   []byte
}

// Sample is one row of the timeline.
type Sample struct {
	// Time, s; Stage index in the pumping order.
	Time  float64
	Stage int
	// Rate into the network, m³/s; Injected since the start, m³.
	Rate, Injected float64
	// BHP of the active stage's well, Pa.
	BHP float64
	// Stimulated area (within numerics.stimulated_reach of stimulated
	// elements) and stimulated fracture area, m².
	StimulatedArea, FractureArea float64
	// SlippedElements have slipped at least once; Events so far.
	SlippedElements, Events int
	// MaxPressure over all elements, Pa.
	MaxPressure float64
	// SeismicMoment (the events) and AseismicMoment (stable slip)
	// released so far, N·m.
	SeismicMoment, AseismicMoment float64
}

// StageSummary sums up one stage.
type StageSummary struct {
	Name string
	// Start, end of pumping and end of shut-in, s.
	Start, PumpEnd, End float64
	// Injected volume, m³; PeakBHP, Pa; NewArea: stimulated area added
	// during the stage, m².
	Injected, PeakBHP, NewArea float64
	Events                     int
	// MaxMagnitude of its events (NaN if none).
	MaxMagnitude float64
	// RateEvents and RateExpected are the sub-resolution events of the
	// seismicity-rate model drawn and expected from the stage's start to
	// the end of its shut-in (0 without the model).
	RateEvents   int
	RateExpected float64
	// Capped tells the pressure cap limited the rate at some time.
	Capped bool
	Steps  int
	// ClusterVolumes is the volume each cluster took, m³ (back-flow
	// during shut-in counted against it); nil without limited entry.
	ClusterVolumes []float64
	// HeldNatural and HeldConduits are the fluid the natural fractures
	// and the primary conduits hold at the end of pumping above what they
	// held at the start of the run, m³ (all stages so far: the rest of
	// what was injected has leaked off).
	HeldNatural, HeldConduits float64
}

// Result is what a run produced, complete or up to a failure.
type Result struct {
	Elements []Element
	Conduits []Conduit
	Grid     scenarios.Grid
	// Final state per element: Pressure, Pa; Aperture and InitialAperture,
	// m; Slip, m; FirstSlip, s (NaN if never); FirstSlipStage (−1 if never).
	Pressure, Aperture, InitialAperture, Slip, FirstSlip []float64
	FirstSlipStage                                       []int
	// Stimulated elements, the time each was stimulated (s, NaN if never)
	// and the stimulated cells (increasing cell indices).
	Stimulated   []bool
	StimulatedAt []float64
	Cells        []int
	Timeline     []Sample
	// FrameTimes are the times of the frames passed to Options.Frame
	// (step ends at or after the output times, and the end), whether or
	// not it is set, s.
	FrameTimes []float64
	Events     []Event
	Stages     []StageSummary
	Warnings   []Warning
	// Totals: Injected, Leaked, m³; MassBalanceError: the sum over the steps
	// of |injected − leaked − stored| relative to the fluid moved (the sum
	// of the larger of |injected| and |stored| per step).
	Injected, Leaked, MassBalanceError float64
	// PeakBHP, Pa; StimulatedArea, FractureArea, m²; StimulatedVolume, m³.
	PeakBHP, StimulatedArea, FractureArea, StimulatedVolume float64
	// NormalStress is the total normal stress of each element's aperture
	// law in the last step, Pa: the in-situ stress plus the stress shadows
	// of all slip and opening, averaged along its trace or conduit.
	NormalStress []float64
	// ShearSlip (signed as elastic's slip) and Opening, m: the final
	// displacement discontinuity of every element, whose stress field
	// CoulombChangeMap evaluates. Nil in a replayed result.
	ShearSlip, Opening []float64
	// CoulombChange is the Coulomb stress change on each element's own
	// plane, Pa: ΔCFS = s·Δτ − μ′·Δσn from all slip and opening so far,
	// with s the sign of its in-situ shear (the sense it is driven in) and
	// μ′ coulomb.effective_friction; the far field as last brought up to
	// date (mechanics.ContactSettings.FarRefresh). Nil in a result replayed
	// from a snapshot that lacks it.
	CoulombChange []float64
	// SeismicMoment is the moment released by ruptures (the events) and
	// AseismicMoment that of stable slip, N·m (M0 = G·Σ A·|Δs|).
	SeismicMoment, AseismicMoment float64
	// PinnedCrossings is the number of places where fractures cross or
	// touch whose slip the contact problem pinned at the end of the run
	// (mechanics.Contact.PinnedCrossings): the aseismic moment is held
	// down there (README, Convergence).
	// 0 in a replayed result.
	PinnedCrossings int
	// Duration of the run, s; Steps accepted and CutSteps repeated.
	Duration        float64
	Steps, CutSteps int
	// Solver is the linear method and FactorEntries its fill (Cholesky).
	Solver        string
	FactorEntries int
	// RateEvents is the catalogue of the seismicity-rate model (nil
	// without [seismicity_rate]; Slip and Area NaN), in time order, and
	// RateExpected its expected number of events.
	RateEvents   []Event
	RateExpected float64
	// Crossings are the meetings of growing fractures with natural ones,
	// in time order.
	Crossings []Crossing
	// Opened marks the elements open at the end (the intact rock ahead of
	// growing fractures' tips is not; nil when nothing grows, read back
	// from the frames in a replayed result), and ConduitHalfLengths is the
	// opened half-length of every conduit, m (nil when nothing grows, and
	// in a replayed result).
	Opened             []bool
	ConduitHalfLengths []float64
	// Depletion is the state production left before the stimulation; nil
	// for none and in a replayed result (Deplete computes it again).
	Depletion *Depletion
	// PathPasses sums up the turns of every run that set the fractures'
	// paths (numerics.path_passes; path.go), the last one's last; nil for
	// straight paths and in a replayed result.
	PathPasses []PathPass
}

// Run simulates the scenario's schedule on the network. On failure it
// returns the result so far together with the error; a scenario that
// cannot be simulated as given matches badinput.Err. With
// numerics.path_passes > 1 and growing fractures it runs the schedule that
// many times, each meshing the fractures' paths through the headings the
// one before met (path.go). Every pass calls opt.Begin with its mesh and
// then opt.Frame, so a recording starts over with each pass and a pass
// that fails or is interrupted leaves its frames so far; it ends the run
// and its result is returned, with the error naming the pass.
// opt.Progress sees the passes as one run.
func Run(ctx context.Context, s *scenarios.Scenario, net *dfn.Network, opt Options) (*Result, error) {
	var plan *pathPlan
	var passes []PathPass
	omega := 1.0 // relaxPlan's factor
	for pass := 1; ; pass++ {
		m, err := newModel(s, net, plan)
		if err != nil {
			return nil, err
		}
		if err := m.checkMemory(opt.MemoryLimit); err != nil {
			return nil, err
		}
		total := pathPasses(m)
		o := opt
		if progress := opt.Progress; progress != nil && total > 1 {
			done := float64(pass - 1)
			o.Progress = func(t, end float64) { progress(done*end+t, float64(total)*end) }
		}
		r, err := newRunner(m, o)
		if err != nil {
			return nil, err
		}
		if total > 1 {
			if r.ms.paths, err = newPathRecorder(m); err != nil {
				return nil, err
			}
		}
		if opt.Begin != nil {
			if err := opt.Begin(m.elements); err != nil {
				return nil, err
			}
		}
		err = r.run(ctx)
		if total > 1 {
			passes = append(passes, r.ms.paths.result())
		}
		if last := pass >= total; last || err != nil {
			res := r.result()
			res.PathPasses = passes
			if !last {
				err = fmt.Errorf("path pass %d of %d: %w", pass, total, err)
			}
			return res, err
		}
		omega = relaxPlan(plan, r.ms.paths.plan, omega)
		plan = r.ms.paths.plan
	}
}

// runner holds the evolving state of a run.
type runner struct {
	m       *model
	opt     Options
	ms      *mechState
	stim    *stimulation
	cur     *flow.State
	next    *flow.State
	eInit   []float64
	t       float64
	end     float64 // nominal end, s
	output  float64 // next output time, s
	res     Result
	stage   int
	shminAt bool // warned about BHP > Shmin in the current stage
	// The last accepted step's rate (m³/s) and bottom-hole pressure (Pa).
	lastRate, lastBHP float64
	// clusterRates holds the rate of each cluster of the stage after a
	// step, m³/s.
	clusterRates []float64
	// rate is the seismicity-rate model (nil without [seismicity_rate]).
	rate *rateModel
	// contentCompressibility is the fluid compressibility the state's
	// contents were computed with, 1/Pa.
	contentCompressibility float64
	lastFrame              float64 // time of the last frame, s
	// massError sums |injected − leaked − stored| over the steps and moved
	// the larger of |injected| and |stored| per step, m³.
	massError, moved float64
	flags            []byte
	// normal is the normal stress of each element's aperture law in the
	// last accepted step, Pa.
	normal []float64
}

func newRunner(m *model, opt Options) (*runner, error) {
	ms, err := newMechState(m)
	if err != nil {
		return nil, err
	}
	r := &runner{m: m, opt: opt, ms: ms, stage: -1,
		stim: newStimulation(m.grid, m.s.Numerics.StimulatedSlip, m.s.Numerics.StimulatedReach, m.elements)}
	r.end = m.s.ScheduleLength()
	r.rate = newRateModel(m)
	r.res.Warnings = append(r.res.Warnings, m.resolutionWarnings()...)
	if m.depletion != nil {
		r.res.Warnings = append(r.res.Warnings, m.depletion.Warnings...)
	}
	r.lastFrame = math.NaN()
	r.flags = make([]byte, len(m.elements))
	r.normal = append([]float64(nil), ms.crackNormal...)
	return r, nil
}

// run is the driver: initialise, then every stage's pumping and shut-in.
func (r *runner) run(ctx context.Context) error {
	if err := r.initialise(); err != nil {
		return err
	}
	for k, ps := range r.m.order {
		if err := r.runStage(ctx, k, ps); err != nil {
			return err
		}
	}
	return r.record(true)
}

// initialise sets the initial state: pore pressure everywhere, apertures
// at the in-situ effective stress.
func (r *runner) initialise() error {
	sys, err := r.system(0)
	if err != nil {
		return err
	}
	if r.m.pInit != nil {
		r.cur = sys.NewStateAt(slices.Clone(r.m.pInit), r.m.p0, r.ms.apertures)
		r.next = sys.NewStateAt(slices.Clone(r.m.pInit), r.m.p0, r.ms.apertures)
	} else {
		r.cur = sys.NewState(r.m.p0, r.ms.apertures)
		r.next = sys.NewState(r.m.p0, r.ms.apertures)
	}
	r.eInit = append([]float64(nil), r.cur.Aperture...)
	r.contentCompressibility = r.m.s.Fluids[r.m.order[0].Fluid].Compressibility
	r.lastBHP = r.wellPressure(0) // no pumping yet: the bottom hole sees the pore pressure
	r.res.Solver = sys.Solver().Method().String()
	r.res.FactorEntries = sys.Solver().CholeskyEntries()
	r.output = 0
	return r.record(false)
}

// system builds the flow system of stage k.
func (r *runner) system(k int) (*flow.System, error) {
	ps := r.m.order[k]
	f := r.m.s.Fluids[ps.Fluid]
	perfs, err := limitedEntry(ps, f, len(r.m.clusterNodes[k]))
	if err != nil {
		return nil, err
	}
	return flow.NewSystem(r.m.mesh, r.m.wellNodes[k], flow.Config{
		Fluid:             flow.Fluid{Viscosity: f.Viscosity, Compressibility: f.Compressibility, Leakoff: f.LeakoffCoefficient},
		ReferencePressure: r.m.p0,
		Linear:            flow.Settings{Method: solverMethod(r.m.s.Numerics.Solver), Tol: r.m.s.Numerics.LinearTolerance},
		Matrix:            matrixLeakoff(r.m.s),
		ClusterNodes:      r.m.clusterNodes[k],
		Perforations:      perfs,
		CubeMean:          r.ms.cubeMean,
	})
}

// limitedEntry is the perforations of a stage's clusters pumping fluid f
// (nil for open clusters: perforations = 0).
func limitedEntry(ps scenarios.PlannedStage, f scenarios.Fluid, clusters int) (*flow.LimitedEntry, error) {
	if ps.Perforations == 0 {
		return nil, nil
	}
	perfs := make([]flow.Perforations, clusters)
	for c := range perfs {
		perfs[c] = flow.Perforations{Count: ps.Perforations, Diameter: ps.PerforationDiameter, Discharge: ps.DischargeCoefficient}
	}
	le, err := flow.NewLimitedEntry(perfs, f.Density)
	if err != nil {
		return nil, badinput.Errorf("stage %s: %v", ps.Name, err)
	}
	return le, nil
}

// matrixLeakoff is the scenario's [matrix] as the fractures' leak-off
// (nil without the table): its cells resolve diffusion from the first
// time step to the whole schedule.
func matrixLeakoff(s *scenarios.Scenario) *flow.Matrix {
	mx := s.Matrix
	if !mx.Present() {
		return nil
	}
	return &flow.Matrix{Permeability: mx.Permeability, Porosity: mx.Porosity, Compressibility: mx.TotalCompressibility,
		Viscosity: mx.Viscosity, HalfWidth: mx.HalfWidth,
		ShortestTime: s.Numerics.TimeStepInitial, LongestTime: math.Max(s.ScheduleLength(), s.Numerics.TimeStepInitial)}
}

func solverMethod(name string) flow.Method {
	switch name {
	case "cholesky":
		return flow.Cholesky
	case "pcg-jacobi":
		return flow.CGJacobi
	case "pcg-ic0":
		return flow.CGIC0
	}
	return flow.Auto
}

// runStage pumps stage k and shuts it in.
func (r *runner) runStage(ctx context.Context, k int, ps scenarios.PlannedStage) error {
	sys, err := r.system(k)
	if err != nil {
		return err
	}
	// Contents are h·L·e·(1 + c_f(p − p0)) at the apertures of the last
	// step: only a fluid of another compressibility changes them.
	if c := r.m.s.Fluids[ps.Fluid].Compressibility; c != r.contentCompressibility {
		sys.Refresh(r.cur)
		r.contentCompressibility = c
	}
	r.cur.BHP = r.wellPressure(k)
	r.cur.Capped = false
	r.stage = k
	r.shminAt = false
	r.warnCapBelowClosure(ps)
	sum := StageSummary{Name: ps.Name, Start: r.t, MaxMagnitude: math.NaN()}
	if ps.Perforations > 0 {
		sum.ClusterVolumes = make([]float64, len(r.m.clusterNodes[k]))
		r.clusterRates = make([]float64, len(sum.ClusterVolumes))
	}
	area0, events0 := r.stim.area(), len(r.res.Events)
	ctl := flow.Control{Mode: flow.RateControl, Rate: ps.Rate, Cap: ps.PressureCap}
	if r.m.s.Schedule.Control == "pressure" {
		ctl = flow.Control{Mode: flow.PressureControl, Pressure: r.m.s.Schedule.InjectionPressure}
	}
	pump := phase{ctl: ctl, volume: ps.Volume, until: r.t + ps.Duration}
	if ps.Duration == 0 {
		// Pumping to a volume: give up at maxStretch times its nominal
		// length, when the pressure cap holds the rate far below target.
		pump.until = r.t + maxStretch*ps.NominalLength()
	}
	if err := r.runPhase(ctx, sys, &pump, &sum); err != nil {
		return err
	}
	if ps.Duration == 0 && !pump.done(math.Inf(-1)) {
		why := "the pressure cap held the rate down"
		if ctl.Mode == flow.PressureControl {
			why = "the injection pressure could not drive the planned rate"
		}
		r.res.Warnings = append(r.res.Warnings, Warning{Kind: WarnVolumeNotReached, Stage: ps.Name, Message: fmt.Sprintf(
			"stage %s: pumped %.1f of %.1f m³ in %.0f s (%d times its nominal length) before it was ended; %s",
			ps.Name, pump.injected, ps.Volume, r.t-sum.Start, maxStretch, why)})
	}
	sum.PumpEnd = r.t
	sum.HeldNatural, sum.HeldConduits = r.held()
	if err := r.record(false); err != nil {
		return err
	}
	shut := phase{ctl: flow.Control{Mode: flow.RateControl}, until: r.t + ps.ShutIn}
	if err := r.runPhase(ctx, sys, &shut, &sum); err != nil {
		return err
	}
	sum.End = r.t
	sum.NewArea = r.stim.area() - area0
	sum.Events = len(r.res.Events) - events0
	sum.MaxMagnitude = MaxMagnitude(r.res.Events[events0:])
	r.res.Stages = append(r.res.Stages, sum)
	return r.record(false)
}

// held returns the fluid the natural fractures and the conduits hold now
// above their content at the start of the run, m³.
func (r *runner) held() (natural, conduits float64) {
	for i, c := range r.cur.Content {
		if r.m.conduitEl[i] {
			conduits += c - r.cur.InitialContent[i]
		} else {
			natural += c - r.cur.InitialContent[i]
		}
	}
	return natural, conduits
}

// wellPressure is a start value for the bottom-hole pressure of stage k:
// the highest pressure of the elements it feeds (not below the initial
// pore pressure, unless production depleted the layer).
func (r *runner) wellPressure(k int) float64 {
	m := r.m.mesh
	p := r.m.p0
	if r.m.pInit != nil {
		p = math.Inf(-1) // after production the well may sit below p0
	}
	for _, n := range r.m.wellNodes[k] {
		for _, e := range m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]] {
			p = math.Max(p, r.cur.Pressure[e])
		}
	}
	return p
}

// phase is one part of a stage: pumping (to a volume or a time) or
// shut-in (to a time).
type phase struct {
	ctl      flow.Control
	volume   float64 // m³ to inject; 0 for none
	until    float64 // end time, s
	injected float64
	lastRate float64
}

// done reports whether the phase has reached its end.
func (p *phase) done(t float64) bool {
	if p.volume > 0 && p.injected >= p.volume*(1-1e-9) {
		return true
	}
	return t >= p.until-1e-9*math.Max(1, p.until)
}

// limit is the longest step that does not pass the phase's end.
func (p *phase) limit(t float64) float64 {
	dt := p.until - t
	if p.volume > 0 {
		rate := p.lastRate
		if rate <= 0 {
			rate = p.ctl.Rate
		}
		if rate > 0 {
			dt = math.Min(dt, (p.volume-p.injected)/rate)
		}
	}
	return dt
}

// maxStretch bounds a volume-driven stage's pumping time, in multiples of
// its nominal length (common practice, no source: a stage that needs ten
// times its planned time is stopped and reported).
const maxStretch = 10

// ErrTooManySteps is returned (wrapped) when a run needs more accepted
// time steps than numerics.max_steps.
var ErrTooManySteps = errors.New("sim: too many time steps")

// numerics.coupling_tolerance τ sets all three stopping criteria of a
// step's flow–mechanics iterations (flow.StepSettings): the largest
// relative aperture change τ, the largest pressure change τ·pressureTolScale
// and the mass-balance error τ·massTolScale of the fluid moved. The scales
// are this program's choice (no source): at the default τ = 1e-4 they give
// 1 Pa and 1e-10, the fixed values of earlier versions, and tightening τ
// tightens every criterion together, so the result converges with τ.
const (
	pressureTolScale = 1e4  // Pa
	massTolScale     = 1e-6 // relative
)

// patientIterations multiplies numerics.coupling_max_iterations for the
// last try of a step at numerics.time_step_min whose flow iterations did
// not converge (see runPhase).
const patientIterations = 4

// errCut marks a step to repeat with a shorter time step.
var errCut = errors.New("sim: cut the step")

// runPhase steps until the phase ends.
func (r *runner) runPhase(ctx context.Context, sys *flow.System, p *phase, sum *StageSummary) error {
	n := r.m.s.Numerics
	z := flow.StepSize{Dt: n.TimeStepInitial, Min: n.TimeStepMin, Max: n.TimeStepMax, MaxChange: n.PressureChangeMax}
	settings := flow.StepSettings{ApertureTol: n.CouplingTolerance, PressureTol: n.CouplingTolerance * pressureTolScale,
		MassTol: n.CouplingTolerance * massTolScale, MaxIterations: n.CouplingMaxIterations,
		MaxIterationChange: n.PressureChangeMax, Restart: r.ms.restart}
	for !p.done(r.t) {
		if err := ctx.Err(); err != nil {
			return err
		}
		// The step ends at the phase's end when it reaches it, exactly.
		// Output times do not shorten steps (an output setting must not
		// change the result): a frame is taken at the end of the first
		// step at or after each output time.
		end := r.t + z.Dt
		for _, mark := range []float64{r.t + p.limit(r.t), p.until} {
			if mark > r.t && mark <= end {
				end = mark
			}
		}
		dt := end - r.t
		err := r.step(sys, p, sum, end, settings, &z)
		if errors.Is(err, errCut) || errors.Is(err, flow.ErrStepNotConverged) || errors.Is(err, flow.ErrNotConverged) {
			r.res.CutSteps++
			z.Dt = math.Min(z.Dt, dt)
			cerr := z.Cut()
			if cerr != nil && errors.Is(err, flow.ErrStepNotConverged) {
				// The shortest step once more, with patientIterations
				// times the iterations: capped at pressure_change_max
				// per iteration, they can need more than the budget to
				// bring an element with almost no storage (an unopened
				// conduit element beside a closing one) to its
				// neighbours' pressure, while the mass balance still
				// converges. Runs that never reach here are unchanged.
				patient := settings
				patient.MaxIterations *= patientIterations
				if err = r.step(sys, p, sum, end, patient, &z); err == nil {
					continue
				}
			}
			if cerr != nil {
				return fmt.Errorf("stage %s at t = %.6g s: %w after repeated cuts (last: %w)", sum.Name, r.t, cerr, err)
			}
			continue
		}
		if err != nil {
			return fmt.Errorf("stage %s at t = %.6g s: %w", sum.Name, r.t, err)
		}
	}
	return nil
}

// step tries one coupled step to time end and accepts it, or returns
// errCut (or the flow error) to have it repeated shorter.
func (r *runner) step(sys *flow.System, p *phase, sum *StageSummary, end float64, set flow.StepSettings, z *flow.StepSize) error {
	n := r.m.s.Numerics
	dt := end - r.t
	if !(dt > 0) {
		return fmt.Errorf("%w: the step %g s is lost in the time %g s", flow.ErrStepTooSmall, z.Dt, r.t)
	}
	res, err := sys.Step(r.cur, r.next, dt, p.ctl, r.ms.apertures, set)
	if err != nil {
		return err
	}
	maxSlip, err := r.ms.solve(r.cur.Pressure, r.next.Pressure)
	if errors.Is(err, mechanics.ErrContactNotConverged) && dt > 16*n.TimeStepMin {
		return fmt.Errorf("%w: %w", errCut, err)
	}
	if err != nil {
		return err
	}
	if maxSlip > n.SlipMax && dt > 16*n.TimeStepMin {
		return errCut
	}
	if r.res.Steps >= n.MaxSteps {
		return fmt.Errorf("%w: the run reached numerics.max_steps = %d accepted steps at t = %.6g s", ErrTooManySteps, n.MaxSteps, r.t)
	}
	// Accept.
	copy(r.normal, r.ms.crackNormal)
	r.res.Events = r.ms.commit(r.t, dt, r.stage, r.next.Pressure, r.res.Events)
	if r.rate != nil {
		var n float64
		drawn := len(r.res.RateEvents)
		r.res.RateEvents, n = r.rate.step(r.m, r.t, dt, r.stage, r.next.Pressure, r.ms.coulombChange(), r.res.RateEvents)
		r.res.RateExpected += n
		sum.RateEvents += len(r.res.RateEvents) - drawn
		sum.RateExpected += n
	}
	var grown []Warning
	r.res.Crossings, grown = r.ms.grow(end, r.stage, r.next.Pressure, r.res.Crossings)
	r.res.Warnings = append(r.res.Warnings, grown...)
	r.startConsistent(sys, r.next)
	r.t = end
	r.next.Time = end
	r.cur, r.next = r.next, r.cur
	r.stim.update(r.ms.state.Travel, r.t)
	p.injected += res.Injected
	if res.Injected > 0 {
		p.lastRate = res.Rate
	}
	r.res.Injected += res.Injected
	r.res.Leaked += res.Leaked
	r.massError += math.Abs(res.MassError)
	r.moved += math.Max(math.Abs(res.Injected), math.Abs(res.Stored))
	r.res.Steps++
	sum.Steps++
	sum.Injected += res.Injected
	if sum.ClusterVolumes != nil {
		sys.ClusterRates(r.clusterRates, r.cur)
		for c, q := range r.clusterRates {
			sum.ClusterVolumes[c] += q * dt
		}
	}
	sum.Capped = sum.Capped || res.Capped
	if sys.HasWell() && p.ctl.Rate+p.ctl.Pressure > 0 {
		sum.PeakBHP = math.Max(sum.PeakBHP, res.BHP)
		r.res.PeakBHP = math.Max(r.res.PeakBHP, res.BHP)
		r.warnTensile(sum.Name, res.BHP)
	}
	r.lastRate, r.lastBHP = res.Rate, res.BHP
	z.Accept(res.MaxChange)
	if r.opt.Progress != nil {
		r.opt.Progress(r.t, r.end)
	}
	if r.t >= r.output-1e-9*math.Max(1, r.output) {
		return r.record(false)
	}
	return nil
}

// warnTensile records, once per stage, that the bottom-hole pressure
// exceeded Shmin, unless the stage's fractures grow (the tensile regime
// is then what the growth models).
func (r *runner) warnTensile(stage string, bhp float64) {
	if r.shminAt || bhp <= r.m.shmin {
		return
	}
	if r.m.s.Wells[r.m.order[r.stage].Well].Grows() {
		return
	}
	r.shminAt = true
	r.res.Warnings = append(r.res.Warnings, Warning{Kind: WarnBHPAboveShmin, Stage: stage, Message: fmt.Sprintf(
		"stage %s: bottom-hole pressure %.2f MPa exceeded Shmin %.2f MPa at t = %.0f s: the run entered the tensile-fracturing regime, which this model treats only approximately (existing fractures open; no new fractures grow unless wells[].growth = \"on\")",
		stage, bhp/1e6, r.m.shmin/1e6, r.t)})
}

// warnCapBelowClosure records that stage ps, whose fractures grow, may
// not raise the bottom-hole pressure above Shmin, their closure stress:
// growth needs a net pressure, so its fractures cannot open or grow. A
// schedule the model represents, but rarely the one meant.
func (r *runner) warnCapBelowClosure(ps scenarios.PlannedStage) {
	if !r.m.s.Wells[ps.Well].Grows() {
		return
	}
	limit, what := pressureLimit(r.m.s, ps)
	if limit > r.m.shmin {
		return
	}
	r.res.Warnings = append(r.res.Warnings, Warning{Kind: WarnCapBelowClosure, Stage: ps.Name, Message: fmt.Sprintf(
		"stage %s: the %s, %.2f MPa, is not above Shmin, %.2f MPa, the closure stress of its fractures: they cannot open or grow, and the stage pumps only what the natural fractures take",
		ps.Name, what, limit/1e6, r.m.shmin/1e6)})
}

// pressureLimit is the highest bottom-hole pressure the schedule lets
// stage ps reach, Pa, and what sets it: the pressure cap, or the
// injection pressure under pressure control if lower.
func pressureLimit(s *scenarios.Scenario, ps scenarios.PlannedStage) (float64, string) {
	if sc := s.Schedule; sc.Control == "pressure" && sc.InjectionPressure < ps.PressureCap {
		return sc.InjectionPressure, "injection pressure"
	}
	return ps.PressureCap, "pressure cap"
}

// record appends a timeline row at the current time (replacing a row at
// the same time) and, at the first step end at or after an output time
// and at the end, passes a frame on.
func (r *runner) record(final bool) error {
	const tol = 1e-9
	interval := r.m.s.Numerics.OutputInterval
	atOutput := r.t >= r.output-tol*math.Max(1, r.output)
	for r.output <= r.t+tol*math.Max(1, r.t) {
		r.output += interval
	}
	s := r.sample()
	if k := len(r.res.Timeline) - 1; k >= 0 && r.res.Timeline[k].Time == r.t {
		r.res.Timeline[k] = s
	} else {
		r.res.Timeline = append(r.res.Timeline, s)
	}
	if (!atOutput && !final) || r.lastFrame == r.t {
		return nil
	}
	r.lastFrame = r.t
	r.res.FrameTimes = append(r.res.FrameTimes, r.t)
	if r.opt.Frame == nil {
		return nil
	}
	for i := range r.flags {
		var f byte
		if r.ms.slipping[i] {
			f |= snapshot.FlagSlipping
		}
		if r.ms.state.Travel[i] > 0 {
			f |= snapshot.FlagSlipped
		}
		if !r.m.conduitEl[i] && r.cur.Pressure[i] > r.ms.crackNormal[i] {
			f |= snapshot.FlagOpen
		}
		if r.stim.element[i] {
			f |= snapshot.FlagStimulated
		}
		if !r.ms.opened[i] {
			f |= snapshot.FlagIntact
		}
		r.flags[i] = f
	}
	return r.opt.Frame(&Frame{Time: r.t, Stage: max(r.stage, 0), Pressure: r.cur.Pressure, CoulombChange: r.ms.coulombChange(),
		Aperture: r.cur.Aperture, Slip: r.ms.state.Travel, Flags: r.flags})
}

// sample is the timeline row of the current state.
func (r *runner) sample() Sample {
	s := Sample{Time: r.t, Stage: r.stage, Rate: r.lastRate, Injected: r.res.Injected, BHP: r.lastBHP,
		StimulatedArea: r.stim.area(), FractureArea: r.stim.fracArea, Events: len(r.res.Events),
		SeismicMoment: r.ms.seismicMoment, AseismicMoment: r.ms.aseismicMoment}
	for i, d := range r.ms.state.Travel {
		if d > 0 {
			s.SlippedElements++
		}
		s.MaxPressure = math.Max(s.MaxPressure, r.cur.Pressure[i])
	}
	return s
}

// result returns what the run produced so far.
func (r *runner) result() *Result {
	res := r.res
	m := r.m
	res.Elements, res.Conduits, res.Grid, res.Depletion = m.elements, m.conduits, m.grid, m.depletion
	if m.anyGrowth() {
		res.Opened = slices.Clone(r.ms.opened)
		res.ConduitHalfLengths = make([]float64, len(m.conduits))
		for c := range m.conduits {
			res.ConduitHalfLengths[c] = r.ms.openedLength[c] / 2
		}
	}
	if r.cur != nil {
		res.Pressure, res.Aperture = r.cur.Pressure, r.cur.Aperture
	}
	res.InitialAperture = r.eInit
	res.Slip, res.FirstSlip, res.FirstSlipStage = r.ms.state.Travel, r.ms.firstSlip, r.ms.firstStage
	res.SeismicMoment, res.AseismicMoment = r.ms.seismicMoment, r.ms.aseismicMoment
	res.PinnedCrossings = r.ms.contact.PinnedCrossings()
	res.NormalStress = r.normal
	res.ShearSlip, res.Opening, res.CoulombChange = r.ms.state.Slip, r.ms.state.Opening, r.ms.coulombChange()
	res.Stimulated, res.StimulatedAt, res.Cells = r.stim.element, r.stim.at, r.stim.cellList()
	res.StimulatedArea, res.FractureArea = r.stim.area(), r.stim.fracArea
	res.StimulatedVolume = res.StimulatedArea * m.s.Layer.Thickness
	if r.rate != nil && r.rate.dropped && !slices.ContainsFunc(res.Warnings, func(w Warning) bool { return w.Kind == WarnRateOverflow }) {
		res.Warnings = append(res.Warnings, Warning{Kind: WarnRateOverflow, Message: "seismicity rate: on some elements one step raised the Coulomb stress by hundreds of a_sigma, beyond any finite rate; their populations were reset to rest and their events of that step are missing: use shorter steps (numerics.time_step_max) or a larger a_sigma"})
	}
	res.Duration = r.t
	if r.moved > 0 {
		res.MassBalanceError = r.massError / r.moved
	}
	return &res
}
