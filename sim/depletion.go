package sim

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/flow"
	"slipfront/internal/badinput"
	"slipfront/internal/orient"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// Depletion is the state that production from the parent wells leaves in
// the layer before the stimulation: the pore-pressure change and the
// poroelastic stress change at the centre of every cell of the depletion
// grid (scenario depletion.cell_size over the map area).
//
// Production: every cluster of a parent well's stages produced through a
// vertical fracture along the in-situ SHmax, of depletion.fracture_half_length
// each way, held at the flowing bottom-hole pressure for depletion.duration
// (infinite-conductivity fractures, the idealisation of Gringarten, Ramey &
// Raghavan 1974, from memory); the layer's matrix drains into them by
// single-phase pressure diffusion in the map plane (flow.Drainage) through
// the scenario's [matrix], with the natural fractures folded into its
// permeability. Stress: the
// change of a layer of the scenario's thickness depleted by the cell
// field, summed exactly over cells (mechanics.GridResponse; Segall 1989 and
// Segall & Fitzgerald 1998 for the model it reduces).
type Depletion struct {
	// Grid is the depletion grid.
	Grid scenarios.Grid
	// Pore is the pore-pressure change of every cell, Pa (negative).
	Pore []float64
	// Change is the stress change at every cell centre.
	Change []mechanics.StressChange
	// Rotation is the rotation of SHmax at every cell centre, radians,
	// positive clockwise (mechanics.SHmaxRotation).
	Rotation []float64
	// CriticalChange is, at every cell centre, the change of the least
	// pore-pressure increase that brings a plane of any orientation to
	// slip (mechanics.Coulomb.OptimalCriticalIncrease, static friction),
	// each counted from its own pore pressure, Pa: positive where
	// production left the rock further from slip.
	CriticalChange []float64
	// Produced is the volume of fluid produced, m³ at reservoir
	// conditions.
	Produced float64
	// HeldCells is the number of cells held at the bottom-hole pressure.
	HeldCells int
	// Warnings say where the result should be read with care.
	Warnings []Warning
}

// Deplete computes the depletion of the scenario's [depletion] table, or
// returns nil when the scenario produces nothing before the stimulation
// (scenarios.Depletion.Active).
func Deplete(s *scenarios.Scenario) (*Depletion, error) {
	dp := s.Depletion
	if !dp.Active() {
		return nil, nil
	}
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return nil, badinput.Mark(err)
	}
	g := s.DepletionGrid()
	held := parentFractureCells(s, g)
	if len(held) == 0 {
		return nil, badinput.Errorf("depletion: no producing fracture of the parent wells %v lies in the map area", dp.Wells)
	}
	mx := s.Matrix
	mobility := make([]float64, g.Cells())
	for i := range mobility {
		mobility[i] = mx.Permeability / mx.Viscosity
	}
	drain := flow.Drainage{Cols: g.Cols, Rows: g.Rows, DX: g.CellSize, DY: g.CellSize,
		Mobility: mobility, Storage: mx.Porosity * mx.TotalCompressibility, Held: held}
	history := []flow.DrainagePeriod{{Drawdown: stress.PorePressure() - dp.BottomholePressure, Duration: dp.Duration}}
	for _, p := range dp.Periods {
		history = append(history, flow.DrainagePeriod{Drawdown: stress.PorePressure() - p.BottomholePressure, Duration: p.Duration})
	}
	if !producing(history) {
		return nil, nil // held at the initial pressure: nothing changes
	}
	pore, produced, err := drain.DepleteHistory(history, dp.TimeSteps)
	if err != nil {
		return nil, fmt.Errorf("depletion: %w", err)
	}
	layer, err := mechanics.LayerFromScenario(s.Rock, s.Layer, dp.Biot)
	if err != nil {
		return nil, badinput.Mark(err)
	}
	resp, err := mechanics.NewGridResponse(layer, mechanics.DepletionGridFromScenario(g))
	if err != nil {
		return nil, badinput.Mark(err)
	}
	d := &Depletion{Grid: g, Pore: pore, Change: make([]mechanics.StressChange, g.Cells()),
		Rotation: make([]float64, g.Cells()), Produced: produced * s.Layer.Thickness, HeldCells: len(held)}
	if err := resp.Change(d.Change, pore, mechanics.AutoSummation); err != nil {
		return nil, fmt.Errorf("depletion: %w", err)
	}
	horizontals := make([]mechanics.Horizontal, g.Cells())
	mechanics.ChangedHorizontals(horizontals, d.Rotation, stress.Horizontal(), d.Change)
	crit, err := mechanics.CoulombFromScenario(s.Rock)
	if err != nil {
		return nil, badinput.Mark(err)
	}
	before := crit.OptimalCriticalIncrease(stress)
	d.CriticalChange = make([]float64, g.Cells())
	changed := 0 // cells whose faulting regime changed
	for k, c := range d.Change {
		after, err := stress.Changed(c)
		if err != nil {
			col, row := g.ColRow(k)
			return nil, badinput.Errorf("depletion: the stress of cell (col %d, row %d): %v", col, row, err)
		}
		d.CriticalChange[k] = crit.OptimalCriticalIncrease(after) - before
		if after.Regime() != stress.Regime() {
			changed++
		}
	}
	d.Warnings = depletionWarnings(g, pore, largestDrawdown(history), changed, stress.Regime())
	return d, nil
}

// producing reports whether a history draws anything: a period of
// positive length at a drawdown other than zero.
func producing(history []flow.DrainagePeriod) bool {
	for _, p := range history {
		if p.Drawdown != 0 && p.Duration > 0 {
			return true
		}
	}
	return false
}

// largestDrawdown is the largest drawdown of the periods of a history
// that last, Pa.
func largestDrawdown(history []flow.DrainagePeriod) float64 {
	var d float64
	for _, p := range history {
		if p.Duration > 0 {
			d = math.Max(d, p.Drawdown)
		}
	}
	return d
}

// edgeDepletion is the share of the drawdown at the map's edge above which
// the closed edge is said to matter (common practice, no source: a tenth
// of the drawdown).
const edgeDepletion = 0.1

// depletionWarnings returns the warnings of a depletion pore on grid g
// with the given drawdown, of which regimeChanged cells left the in-situ
// faulting regime.
func depletionWarnings(g scenarios.Grid, pore []float64, drawdown float64, regimeChanged int, regime string) []Warning {
	var ws []Warning
	var edge float64
	for k, v := range pore {
		if col, row := g.ColRow(k); col == 0 || row == 0 || col == g.Cols-1 || row == g.Rows-1 {
			edge = math.Max(edge, -v)
		}
	}
	if edge > edgeDepletion*drawdown {
		ws = append(ws, Warning{Kind: WarnDepletionAtEdge, Message: fmt.Sprintf(
			"depletion: the pore pressure fell by %.1f MPa (%.0f %% of the drawdown) at the edge of the map area, whose closed edge holds in fluid an open reservoir would let flow: enlarge the domain, or read the depletion near the edge as overstated",
			edge/1e6, 100*edge/drawdown)})
	}
	if regimeChanged > 0 {
		ws = append(ws, Warning{Kind: WarnRegimeChanged, Message: fmt.Sprintf(
			"depletion: the order of the principal stresses changed from the in-situ %s regime in %.1f %% of the map area (where the horizontal stresses fell past Sv or each other)",
			regime, 100*float64(regimeChanged)/float64(g.Cells()))})
	}
	return ws
}

// parentFractureCells returns the depletion-grid cells that the producing
// fractures of the parent wells pass through, each once, in the order met:
// every point of a fracture within an eighth of a cell of a sample lies in
// a listed cell's neighbourhood, so no cell it crosses by more than a
// sliver is missed.
func parentFractureCells(s *scenarios.Scenario, g scenarios.Grid) []int {
	strike := orient.Line(s.Stress.SHmaxAzimuth, 0)
	dir := r2.Vec{X: strike.X, Y: strike.Y}
	half := s.Depletion.FractureHalfLength
	samples := int(math.Ceil(16 * half / g.CellSize))
	seen := map[int]bool{}
	var held []int
	for _, w := range s.Wells {
		if !isParent(s, w.Name) {
			continue
		}
		path := make([]r2.Vec, len(w.Path))
		for i, p := range w.Path {
			path[i] = r2.Vec{X: p.X, Y: p.Y}
		}
		for _, st := range w.Stages {
			for _, at := range st.Clusters {
				centre := PointAlong(path, at)
				for k := -samples; k <= samples; k++ {
					p := r2.Add(centre, r2.Scale(half*float64(k)/float64(samples), dir))
					if c, ok := g.CellAt(p.X, p.Y); ok && !seen[c] {
						seen[c] = true
						held = append(held, c)
					}
				}
			}
		}
	}
	return held
}

func isParent(s *scenarios.Scenario, well string) bool {
	for _, name := range s.Depletion.Wells {
		if name == well {
			return true
		}
	}
	return false
}

// At returns the depletion's change at the local point p: bilinear
// between the four nearest cell centres (constant beyond the outermost
// centres), so a fracture element feels the field where it lies rather
// than its cell's mean.
func (d *Depletion) At(p r2.Vec) mechanics.StressChange {
	g := d.Grid
	fx := (p.X-g.XMin)/g.CellSize - 0.5
	fy := (p.Y-g.YMin)/g.CellSize - 0.5
	c0, wx := bracket(fx, g.Cols)
	r0, wy := bracket(fy, g.Rows)
	c1, r1 := min(c0+1, g.Cols-1), min(r0+1, g.Rows-1)
	var out mechanics.StressChange
	for _, corner := range [4]struct {
		col, row int
		w        float64
	}{{c0, r0, (1 - wx) * (1 - wy)}, {c1, r0, wx * (1 - wy)}, {c0, r1, (1 - wx) * wy}, {c1, r1, wx * wy}} {
		if corner.w == 0 {
			continue
		}
		c := d.Change[g.Index(corner.col, corner.row)]
		out.XX += corner.w * c.XX
		out.YY += corner.w * c.YY
		out.XY += corner.w * c.XY
		out.ZZ += corner.w * c.ZZ
		out.Pore += corner.w * c.Pore
	}
	return out
}

// bracket returns the lower of the two cell centres around the fractional
// centre coordinate f of a grid of n cells and the weight of the upper one,
// clamped to the outermost centres.
func bracket(f float64, n int) (lower int, w float64) {
	switch {
	case !(f > 0):
		return 0, 0
	case f >= float64(n-1):
		return n - 1, 0
	}
	lower = int(f)
	return lower, f - float64(lower)
}
