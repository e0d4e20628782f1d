package sim

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/flow"
	"slipfront/mechanics"
)

// Growing fractures. A well with growth = "on" has its primary conduits
// meshed to their largest extent (conduit_half_length each way of the
// cluster) but open only over initial_half_length; the elements beyond
// are intact rock: a flaw of FlawAperture that opens not at all and loads
// nothing. After every accepted step each tip advances by one element
// where the stress intensity of the opened fracture reaches the rock's
// toughness,
//
//	K_I = p_net·√(π·a) ≥ K_Ic,  a = min(ℓ, h/2),
//
// with p_net the net pressure (p − σn) of the tip element, ℓ the
// fracture's half-length and h its height: Irwin's (1957) K of a crack of
// half-length a under a uniform net pressure, which is exact for the
// toughness-dominated plane-strain fracture (KGD-K: Detournay 2004, whose
// pressure is uniform) and takes the height as the crack's size once the
// fracture is longer than high, as the opening compliance does (Sneddon
// 1946, from the smaller of length and height; a height-contained blade,
// Perkins & Kern 1961). The opened part's compliance follows its length as
// it grows, and each element opens under its own pressure as the
// conduits always do.
//
// The fluid reaches a new tip element by the flow alone: the element
// keeps the content it had as a flaw (at the pressure of the fracture
// behind, which filled it through their face), and the faces along a
// growing conduit conduct with the mean of the cubes of the two
// apertures (flow.Config.CubeMean: the exact face flux of a fracture
// whose opening follows its pressure, so an open element passes e³/4 to
// the closed one ahead). Where toughness governs,
// the tip waits for K_I; where viscosity governs, K_I is reached as soon
// as fluid arrives, and the front moves as fast as the flow fills the tip
// element: the viscosity-dominated plane-strain solution (KGD-M) and the
// height-contained one (Nordgren's equation for the model's slot channel,
// hfref.Channel) are followed as well as KGD-K (see the tests), and the
// front converges at first order in the element length (it leads by one to
// two and a half elements: an element counts as open from the step it
// starts to fill).
//
// Where a tip meets a natural fracture (a mesh junction between the
// conduit and a trace) the criterion of Renshaw & Pollard (1995), in the
// non-orthogonal form of mechanics.Approach (after Gu et al. 2012), decides
// whether it crosses and goes on, is arrested, or opens the natural
// fracture (diverted; the fluid then follows the natural fracture through
// the junction and the conduit stops growing on that side: re-initiation
// at the natural fracture's end is not modelled). Every meeting is a
// Crossing of the result.
//
// Left out (see the README): the path is straight along the local SHmax
// at the cluster (the stress shadows of neighbours do not curve it), the
// front moves by whole elements, and a tip advances at most one element
// per step (the pressure-change control of the time step shortens the
// steps while fluid enters new elements).

// FlawAperture is the aperture of the intact rock ahead of a growing
// fracture's tip, m: a closed flaw whose own transmissivity is ~10⁻⁹ of a
// 1 mm fracture's and whose storage is negligible (common practice, no
// source); fluid reaches it from an open neighbour through their
// mean-of-cubes face, not through its own aperture.
const FlawAperture = 1e-6

// Crossing is what a growing fracture did where its tip met a natural
// fracture.
type Crossing struct {
	// Time of the meeting, s, and the stage index.
	Time  float64
	Stage int
	// Conduit indexes Result.Conduits; Trace and Fracture the natural
	// fracture met.
	Conduit, Trace, Fracture int
	// X, Y: where they met, local m.
	X, Y float64
	// Angle between the two fractures in map view, radians in (0, π/2].
	Angle float64
	// Outcome is "cross", "arrest" or "divert" (mechanics.Crossing).
	Outcome string
}

// tipState is a growing conduit's opened extent: the indices of its first
// and last opened elements in its group (ms.groups), and whether each
// side has stopped (arrested, diverted or at the end of its path).
type tipState struct {
	lo, hi  int
	stopped [2]bool
	warned  bool // reached the end of its path: warned once
}

// initGrowth marks every element opened or not: natural elements and the
// conduits of wells without growth whole, growing conduits within
// initial_half_length of their cluster (at least the element on each side
// of it).
func (ms *mechState) initGrowth() {
	m := ms.m
	nt := len(m.net.Traces)
	ms.opened = make([]bool, len(m.elements))
	for i := range ms.opened {
		ms.opened[i] = true
	}
	ms.tips = make([]tipState, len(m.conduits))
	for c, cd := range m.conduits {
		g := ms.groups[nt+c]
		ms.tips[c] = tipState{lo: 0, hi: len(g) - 1, stopped: [2]bool{true, true}}
		ms.openedLength[c] = ms.groupLength[nt+c]
		if !m.growing(cd) {
			continue
		}
		if ms.growingEl == nil {
			ms.growingEl = make([]bool, len(m.elements))
		}
		for _, i := range g {
			ms.growingEl[i] = true
		}
		w := m.s.Wells[m.order[cd.Stage].Well]
		half := ms.groupLength[nt+c] / 2
		lo, hi := len(g), -1
		var s float64
		for k, i := range g {
			l := m.elements[i].Length
			centre := s + l/2 - half
			s += l
			near := math.Abs(centre) <= w.InitialHalfLength || math.Abs(centre) <= l
			ms.opened[i] = near
			if near {
				lo, hi = min(lo, k), max(hi, k)
			} else {
				ms.conduitAperture0[i] = FlawAperture
			}
		}
		for _, i := range g {
			if !ms.opened[i] {
				ms.openingShape[i] = 0
			}
		}
		ms.tips[c] = tipState{lo: lo, hi: hi, stopped: [2]bool{lo == 0, hi == len(g)-1}}
		ms.resizeConduit(c)
	}
}

// anyGrowth reports whether some conduit grows.
func (m *model) anyGrowth() bool {
	return slices.ContainsFunc(m.conduits, m.growing)
}

// growing reports whether conduit cd grows (its well's growth is on).
func (m *model) growing(cd Conduit) bool {
	return m.s.Wells[m.order[cd.Stage].Well].Grows()
}

// resizeConduit sets the compliance, the opening shape and the crack
// normal stress of conduit c's elements from its opened extent.
func (ms *mechState) resizeConduit(c int) {
	m := ms.m
	g := ms.groups[len(m.net.Traces)+c]
	tp := ms.tips[c]
	var length float64
	for _, i := range g[tp.lo : tp.hi+1] {
		length += m.elements[i].Length
	}
	crack := mechanics.PlaneStrainCrack{ShearModulus: m.s.Rock.ShearModulus, PoissonRatio: m.s.Rock.PoissonRatio}
	k := crack.OpeningStiffness(mechanics.Patch{Length: length, Height: m.conduits[c].Height})
	var s float64
	for _, i := range g[tp.lo : tp.hi+1] {
		l := m.elements[i].Length
		xi := (s + l/2 - length/2) / (length / 2)
		ms.openingShape[i] = 4 / math.Pi * math.Sqrt(math.Max(1-xi*xi, 0))
		ms.crackStiffness[i] = k
		s += l
	}
	ms.openedLength[c] = length
	ms.averageNormal()
}

// grow advances the tips of every growing conduit whose stress intensity
// reaches the toughness at the pressures p of the step that ended at t in
// stage k, by one element each, deciding the meetings with natural
// fractures; it returns the crossings with the new ones appended and a
// warning for each conduit that reached the end of its path with a tip
// still able to grow.
func (ms *mechState) grow(t float64, k int, p []float64, crossings []Crossing) ([]Crossing, []Warning) {
	m := ms.m
	nt := len(m.net.Traces)
	kic := m.s.Rock.FractureToughness
	var warnings []Warning
	for c := range ms.tips {
		tp := &ms.tips[c]
		if tp.stopped[0] && tp.stopped[1] {
			continue
		}
		g := ms.groups[nt+c]
		h := m.conduits[c].Height
		a := math.Min(ms.openedLength[c]/2, h/2)
		grew := false
		for side, dir := range [2]int{-1, 1} {
			if tp.stopped[side] {
				continue
			}
			tip := tp.lo
			if dir > 0 {
				tip = tp.hi
			}
			i := g[tip]
			if net := p[i] - ms.crackNormal[i]; !(net > 0 && net*math.Sqrt(math.Pi*a) >= kic) {
				continue
			}
			next := tip + dir
			if next < 0 || next >= len(g) {
				tp.stopped[side] = true
				if own := m.order[m.conduits[c].Stage]; !tp.warned {
					tp.warned = true
					warnings = append(warnings, Warning{Kind: WarnGrowthAtEnd, Stage: m.order[k].Name, Message: fmt.Sprintf(
						"the fracture of cluster %d of stage %s reached conduit_half_length = %g m at t = %.0f s with a tip still able to grow: raise wells[%d].conduit_half_length",
						m.conduits[c].Cluster, own.Name, m.s.Wells[own.Well].ConduitHalfLength, t, own.Well)})
				}
				continue
			}
			j := g[next]
			var outcome mechanics.Crossing
			crossings, outcome = ms.meet(t, k, c, i, j, p[i], crossings)
			if outcome != mechanics.Cross {
				tp.stopped[side] = true
				continue
			}
			ms.opened[j] = true
			if dir > 0 {
				tp.hi = next
			} else {
				tp.lo = next
			}
			grew = true
		}
		if grew {
			ms.resizeConduit(c)
		}
	}
	return crossings, warnings
}

// meet decides, for conduit c whose tip element i is about to open its
// neighbour j, what happens at every natural fracture that meets the
// conduit at the node between them; it returns the crossings with the
// meetings appended and the outcome that governs the tip (Cross when
// there is no natural fracture there or every one is crossed).
func (ms *mechState) meet(t float64, k, c, i, j int, fluid float64, crossings []Crossing) ([]Crossing, mechanics.Crossing) {
	m := ms.m
	nt := len(m.net.Traces)
	mesh := m.mesh
	node := ms.sharedNode(i, j)
	if node < 0 {
		return crossings, mechanics.Cross
	}
	result := mechanics.Cross
	seen := map[int]bool{}
	el := m.elements[i]
	along := r2.Unit(r2.Sub(el.P1, el.P0))
	// The meeting point: the end of the tip element that j shares.
	at := el.P1
	if nj := m.elements[j]; math.Min(r2.Norm(r2.Sub(el.P0, nj.P0)), r2.Norm(r2.Sub(el.P0, nj.P1))) <
		math.Min(r2.Norm(r2.Sub(el.P1, nj.P0)), r2.Norm(r2.Sub(el.P1, nj.P1))) {
		at = el.P0
	}
	for _, e := range mesh.NodeElems[mesh.NodeStart[node]:mesh.NodeStart[node+1]] {
		tr := m.elements[e].Trace
		if m.mesh.Elements[e].Path >= nt || seen[tr] {
			continue
		}
		seen[tr] = true
		other := m.net.Traces[tr]
		dir := r2.Unit(r2.Sub(other.P1, other.P0))
		angle := math.Acos(math.Min(1, math.Abs(r2.Dot(along, dir))))
		stress := ms.m.stressAt(r2.Scale(0.5, r2.Add(el.P0, el.P1)))
		parallel, normal := planeNormalStresses(stress, along)
		ap := mechanics.Approach{Angle: math.Max(angle, 1e-6), ParallelStress: parallel, NormalStress: normal,
			PorePressure: m.initialPressure(i), FluidPressure: fluid, TensileStrength: m.s.Rock.TensileStrength,
			Friction: m.s.Rock.FrictionStatic, Cohesion: m.s.Rock.Cohesion}
		outcome, err := ap.Decide()
		if err != nil {
			outcome = mechanics.Arrest // non-finite input: stop rather than cross blindly
		}
		crossings = append(crossings, Crossing{Time: t, Stage: k, Conduit: c, Trace: tr, Fracture: other.Fracture,
			X: at.X, Y: at.Y, Angle: angle, Outcome: outcome.String()})
		if outcome != mechanics.Cross {
			result = outcome
		}
	}
	return crossings, result
}

// sharedNode returns the mesh node elements i and j share, or −1.
func (ms *mechState) sharedNode(i, j int) int {
	nodes := ms.nodesOf(i)
	for _, n := range ms.nodesOf(j) {
		if n >= 0 && (n == nodes[0] || n == nodes[1]) {
			return n
		}
	}
	return -1
}

// nodesOf returns the two nodes of element i (−1 where it has fewer),
// from an index built on first use.
func (ms *mechState) nodesOf(i int) [2]int {
	if ms.elementNodes == nil {
		mesh := ms.m.mesh
		ms.elementNodes = make([][2]int, len(mesh.Elements))
		for e := range ms.elementNodes {
			ms.elementNodes[e] = [2]int{-1, -1}
		}
		for n := 0; n < mesh.NumNodes(); n++ {
			for _, e := range mesh.NodeElems[mesh.NodeStart[n]:mesh.NodeStart[n+1]] {
				en := &ms.elementNodes[e]
				if en[0] < 0 {
					en[0] = n
				} else {
					en[1] = n
				}
			}
		}
	}
	return ms.elementNodes[i]
}

// planeNormalStresses returns the horizontal normal stresses along the
// unit map direction t and across it, Pa, of a stress state.
func planeNormalStresses(s mechanics.Stress, t r2.Vec) (along, across float64) {
	ts := s.Tensor()
	n := r2.Vec{X: -t.Y, Y: t.X}
	quad := func(v r2.Vec) float64 {
		return v.X*(ts[0][0]*v.X+ts[0][1]*v.Y) + v.Y*(ts[1][0]*v.X+ts[1][1]*v.Y)
	}
	return quad(t), quad(n)
}

// startConsistent sets the pressure of every opened element of a growing
// conduit that starts the next step closed (at or below the crack's normal
// stress) while its content fills more than the closed aperture e₀, in the
// state st, to what its content holds: the normal stress plus the net
// pressure k·(e − e₀) for the aperture e its content fills, where that
// is above 1 Pa (contents are untouched, so mass is conserved exactly). A
// growing fracture's closure stress and stiffness move with its length and
// shadows, so an element can end a step open and start the next one below
// its new closure stress with the content of an open one. Started closed,
// its first iteration saw no compliance, moved the pressure by the whole
// iteration cap and opened the element by millimetres: realization 1 of
// the demo on 5 m elements stalled so, 23 s into its first
// stage (TestGrowthDemoFineMesh). Elements already open are left
// alone: their iterations see the compliance. The state is the accepted
// step's, so the frames recorded after it and the next step's leak-off
// see the adjusted pressures (a closed element's, by at most its net).
func (r *runner) startConsistent(sys *flow.System, st *flow.State) {
	ms := r.ms
	if ms.growingEl == nil {
		return
	}
	for j, growing := range ms.growingEl {
		if !growing || !ms.opened[j] || st.Pressure[j] > ms.crackNormal[j] {
			continue
		}
		e := st.Content[j] / sys.Content(j, 1, st.Pressure[j]) // the aperture its content fills
		// Above the flow's pressure tolerance (1 Pa): a closed element's
		// own content gives e = e₀ but for rounding.
		if net := ms.crackStiffness[j] * (e - ms.conduitAperture0[j]); net > 1 {
			st.Pressure[j] = ms.crackNormal[j] + net
		}
	}
}

// IsOpen reports whether element i of a result is open: the intact rock
// ahead of a growing fracture's tips is not (Result.Opened, read back
// from the frames' FlagIntact in a replayed result).
func (res *Result) IsOpen(i int) bool {
	return res.Opened == nil || res.Opened[i]
}
