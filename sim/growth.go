package sim

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/flow"
	"slipfront/internal/orient"
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
// the junction and the conduit stops growing on that side). Every meeting
// is a Crossing of the result.
//
// A fracture stopped at a natural fracture may re-initiate at that
// fracture's end once the fluid has opened it there: at once if it was
// diverted, later if it was arrested and the pressure rises (the usual
// picture of an offset crossing; common practice, no source: the form here
// is ours). Its branches are meshed before the run, like the conduits, so
// no element joins the mesh during it. Wherever a growing conduit's path
// meets a natural fracture that it would not cross (the crossing criterion
// does not depend on the fluid's pressure, so it is decided before the
// run, under the stresses before injection) and that the fluid could open
// (its normal stress is below the highest bottom-hole pressure the
// schedule allows; the fluid's pressure is highest at the well), a branch
// starts at each end of the natural fracture that does not lie behind the
// meeting as seen from the travelling tip. It strikes along the local
// SHmax (or turns by the stress shadows, path.go), onward from the side of
// the well the tip came from, and is as long as the path left beyond the
// meeting. Branches meet natural
// fractures as the conduits do, and may branch in turn.
//
// A branch stays intact rock, cut off from its natural fracture (their
// face conducts as the series of the two halves, the branch's a flaw),
// until a tip travelling its way stops at that natural fracture (arrested
// or diverted). Then the face takes the mean of the cubes, as a growing
// conduit's do, so the flaw fills with the natural fracture's fluid, and
// the branch re-initiates when the natural fracture's net pressure at its
// end gives that crack the toughness,
//
//	(p − σn)·√(π·a) ≥ K_Ic,  a = min(L, h)/2
//
// (Irwin 1957, as above; L and h the natural fracture's trace length and
// height). From then on it grows from its free end as a conduit does; it
// opens, and its tip's K is taken, as one crack with the natural
// fracture, of length ℓ + L with ℓ its opened length. Each re-initiation
// is a Crossing with the outcome Reinitiated.
//
// The path is straight along the local SHmax at the cluster, or turned
// by the stress shadows of the other fractures over numerics.path_passes
// runs (path.go). Left out (see the README): the front moves by whole
// elements, and a tip advances at most one element
// per step (the pressure-change control of the time step shortens the
// steps while fluid enters new elements).

// FlawAperture is the aperture of the intact rock ahead of a growing
// fracture's tip, m: a closed flaw whose own transmissivity is ~10⁻⁹ of a
// 1 mm fracture's and whose storage is negligible (common practice, no
// source); fluid reaches it from an open neighbour through their
// mean-of-cubes face, not through its own aperture.
const FlawAperture = 1e-6

// Crossing is what a growing fracture did where its tip met a natural
// fracture, or where a branch re-initiated at a natural fracture's end.
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
	// Outcome is "cross", "arrest" or "divert" (mechanics.Crossing), or
	// Reinitiated (Conduit is then the branch, Trace the natural fracture
	// at whose end it started, X, Y that end).
	Outcome string
}

// Reinitiated is the Crossing.Outcome of a branch re-initiating at the
// end of a natural fracture.
const Reinitiated = "reinitiate"

// tipState is a growing conduit's opened extent: the indices of its first
// and last opened elements in its group (ms.groups), and whether each
// side has stopped (arrested, diverted or at the end of its path). A
// branch is dormant until it re-initiates, armed once a tip travelling its
// way stopped at its natural fracture; source is the element of that
// natural fracture at the branch's start.
type tipState struct {
	lo, hi  int
	stopped [2]bool
	warned  bool // reached the end of its path: warned once
	dormant bool
	armed   bool
	source  int
}

// branchKey names a branch: its natural trace, the end it starts at (0
// at P0, 1 at P1) and the sense along SHmax it grows in (±1).
type branchKey struct{ trace, end, sense int }

// branches returns the new branches that conduit c may re-initiate along
// where its path crosses a natural fracture at x (see the top of this
// file), recording them in seen so that each is meshed once: none unless
// c grows with reinitiation on, has at least one element length of path
// left beyond x, would not cross the natural fracture there and could
// open it at a pressure up to highest, Pa (model.highestPressure); each
// runs through its headings in plan (path.go; nil for straight).
func (m *model) branches(seen map[branchKey]bool, c int, x dfn.PathCrossing, highest float64, plan *pathPlan) []Conduit {
	cd := m.conduits[c]
	if !m.growing(cd) || m.s.Wells[m.order[cd.Stage].Well].Reinitiation != "on" {
		return nil
	}
	length := cd.Length
	along := cd.directionAt(x.Distance)
	// A cluster's conduit grows both ways from its middle, a branch from P0.
	travel, left := along, length-x.Distance
	if !cd.IsBranch() && x.Distance < length/2 {
		travel, left = r2.Scale(-1, along), x.Distance
	}
	if left < m.s.Numerics.ElementLength {
		return nil
	}
	stress := m.stressAt(x.Point)
	if ap, _ := m.approach(stress, along, x.Segment, stress.PorePressure(), 0); ap.Crosses() || ap.OpeningPressure() > highest {
		return nil
	}
	tr := m.net.Traces[x.Segment]
	var out []Conduit
	for end, p := range [2]r2.Vec{tr.P0, tr.P1} {
		if r2.Dot(r2.Sub(p, x.Point), travel) < -dfn.GeomTol {
			continue // behind the meeting
		}
		strike := orient.Line(m.shmaxAzimuth(p), 0)
		dir, sense := r2.Vec{X: strike.X, Y: strike.Y}, 1
		if r2.Dot(dir, travel) < 0 {
			dir, sense = r2.Scale(-1, dir), -1
		}
		key := branchKey{trace: x.Segment, end: end, sense: sense}
		if seen[key] {
			continue
		}
		seen[key] = true
		br := Conduit{Stage: cd.Stage, Cluster: cd.Cluster, Aperture: cd.Aperture, Height: cd.Height,
			Length: left, Source: x.Segment, P0: p, key: key}
		var headings []heading
		if plan != nil {
			headings = plan.branches[key]
		}
		br.P1, br.Via = m.branchPath(p, dir, left, headings)
		out = append(out, br)
	}
	return out
}

// highestPressure is the highest bottom-hole pressure the schedule lets
// any stage reach, Pa: the fluid's pressure is highest at the well, so a
// natural fracture whose normal stress is above it is never opened, and
// no fracture re-initiates at its ends.
func (m *model) highestPressure() float64 {
	var p float64
	for _, ps := range m.order {
		limit, _ := pressureLimit(m.s, ps)
		p = math.Max(p, limit)
	}
	return p
}

// mapAngle is the angle between two lines of directions a and b in map
// view, radians in [0, π/2].
func mapAngle(a, b r2.Vec) float64 {
	return math.Acos(math.Min(1, math.Abs(r2.Dot(r2.Unit(a), r2.Unit(b)))))
}

// approach is a tip travelling along the unit map direction along that
// meets natural trace tr under the stress state stress, with the rock's
// pore pressure and the fluid's pressure there, Pa; it returns the angle
// between the two fractures in map view too, radians in [0, π/2].
func (m *model) approach(stress mechanics.Stress, along r2.Vec, tr int, pore, fluid float64) (mechanics.Approach, float64) {
	other := m.net.Traces[tr]
	angle := mapAngle(along, r2.Sub(other.P1, other.P0))
	parallel, normal := planeNormalStresses(stress, along)
	return mechanics.Approach{Angle: math.Max(angle, 1e-6), ParallelStress: parallel, NormalStress: normal,
		PorePressure: pore, FluidPressure: fluid, TensileStrength: m.s.Rock.TensileStrength,
		Friction: m.s.Rock.FrictionStatic, Cohesion: m.s.Rock.Cohesion}, angle
}

// initGrowth marks every element opened or not: natural elements and the
// conduits of wells without growth whole, growing conduits within
// initial_half_length of their cluster (at least the element on each side
// of it), branches not at all. The elements not opened are intact rock:
// flaws to the flow, and to the contact problem elements that cannot move
// (mechanics.ContactElement.Intact) until a tip opens them.
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
		if cd.IsBranch() {
			for _, i := range g {
				ms.opened[i], ms.conduitAperture0[i], ms.openingShape[i] = false, FlawAperture, 0
			}
			ms.tips[c] = tipState{lo: 0, hi: -1, stopped: [2]bool{true, true}, dormant: true, source: ms.sourceElement(c)}
			ms.openedLength[c] = 0
			continue
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
	}
	ms.cubeMean = slices.Clone(ms.growingEl)
}

// sizeGrowing sets the compliance and opening shape of the opened part of
// every growing conduit (once the contact state exists).
func (ms *mechState) sizeGrowing() {
	for c, cd := range ms.m.conduits {
		if ms.m.growing(cd) && !ms.tips[c].dormant {
			ms.resizeConduit(c)
		}
	}
}

// open opens element i ahead of a tip: to the flow, and to slip and
// opening in the contact problem.
func (ms *mechState) open(i int) {
	ms.opened[i] = true
	ms.contact.Release(i)
}

// sourceElement is the element of branch c's natural fracture at the
// branch's start.
func (ms *mechState) sourceElement(c int) int {
	g := ms.groups[ms.m.conduits[c].Source]
	first, last := g[0], g[len(g)-1]
	start := ms.m.conduits[c].P0
	if r2.Norm(r2.Sub(ms.m.elements[first].P0, start)) <= r2.Norm(r2.Sub(ms.m.elements[last].P1, start)) {
		return first
	}
	return last
}

// crackLength is the length of the crack that conduit c's opened part
// belongs to, m: its opened length, and for a branch that of its natural
// fracture too.
func (ms *mechState) crackLength(c int) float64 {
	l := ms.openedLength[c]
	if cd := ms.m.conduits[c]; cd.IsBranch() {
		l += ms.m.net.Traces[cd.Source].Length
	}
	return l
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
	ms.openedLength[c] = length
	crack := mechanics.PlaneStrainCrack{ShearModulus: m.s.Rock.ShearModulus, PoissonRatio: m.s.Rock.PoissonRatio}
	k := crack.OpeningStiffness(mechanics.Patch{Length: ms.crackLength(c), Height: m.conduits[c].Height})
	var s float64
	for _, i := range g[tp.lo : tp.hi+1] {
		l := m.elements[i].Length
		xi := (s + l/2 - length/2) / (length / 2)
		ms.openingShape[i] = 4 / math.Pi * math.Sqrt(math.Max(1-xi*xi, 0))
		ms.crackStiffness[i] = k
		s += l
	}
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
		if tp.dormant {
			if tp.armed && ms.reinitiates(c, p) {
				crossings = append(crossings, ms.reinitiate(t, k, c))
			}
			continue
		}
		if tp.stopped[0] && tp.stopped[1] {
			continue
		}
		g := ms.groups[nt+c]
		h := m.conduits[c].Height
		a := math.Min(ms.crackLength(c)/2, h/2)
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
					what := "the fracture"
					if cd := m.conduits[c]; cd.IsBranch() {
						what = fmt.Sprintf("the branch re-initiated at the end of natural fracture %d from the fracture", m.net.Traces[cd.Source].Fracture)
					}
					warnings = append(warnings, Warning{Kind: WarnGrowthAtEnd, Stage: m.order[k].Name, Message: fmt.Sprintf(
						"%s of cluster %d of stage %s reached conduit_half_length = %g m at t = %.0f s with a tip still able to grow: raise wells[%d].conduit_half_length",
						what, m.conduits[c].Cluster, own.Name, m.s.Wells[own.Well].ConduitHalfLength, t, own.Well)})
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
			ms.open(j)
			if ms.paths != nil {
				ms.paths.record(ms, c, i, j)
			}
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
	mid := r2.Scale(0.5, r2.Add(el.P0, el.P1))
	travel := r2.Unit(r2.Sub(at, mid))
	for _, e := range mesh.NodeElems[mesh.NodeStart[node]:mesh.NodeStart[node+1]] {
		tr := m.elements[e].Trace
		if m.mesh.Elements[e].Path >= nt || seen[tr] {
			continue
		}
		seen[tr] = true
		ap, angle := m.approach(m.stressAt(mid), along, tr, m.initialPressure(i), fluid)
		outcome, err := ap.Decide()
		if err != nil {
			outcome = mechanics.Arrest // non-finite input: stop rather than cross blindly
		}
		crossings = append(crossings, Crossing{Time: t, Stage: k, Conduit: c, Trace: tr, Fracture: m.net.Traces[tr].Fracture,
			X: at.X, Y: at.Y, Angle: angle, Outcome: outcome.String()})
		if outcome != mechanics.Cross {
			result = outcome
			ms.arm(tr, travel)
		}
	}
	return crossings, result
}

// arm makes ready to re-initiate the branches at the ends of natural
// trace tr that grow the way a tip stopped there travelled: their first
// face with the natural fracture now conducts as a growing fracture's
// (the flow system reads ms.cubeMean as it assembles).
func (ms *mechState) arm(tr int, travel r2.Vec) {
	for b, cd := range ms.m.conduits {
		if tp := &ms.tips[b]; cd.Source == tr && tp.dormant && !tp.armed && r2.Dot(cd.directionAt(0), travel) > 0 {
			tp.armed = true
			ms.cubeMean[tp.source] = true
		}
	}
}

// reinitiates reports whether armed branch c re-initiates at the pressures
// p: the net pressure of its natural fracture's end element gives that
// crack the toughness (see the top of this file).
func (ms *mechState) reinitiates(c int, p []float64) bool {
	tr := ms.m.net.Traces[ms.m.conduits[c].Source]
	s := ms.tips[c].source
	a := math.Min(tr.Length, tr.Height) / 2
	net := p[s] - ms.crackNormal[s]
	return net > 0 && net*math.Sqrt(math.Pi*a) >= ms.m.s.Rock.FractureToughness
}

// reinitiate opens the first element of branch c at time t of stage k and
// returns the record of it.
func (ms *mechState) reinitiate(t float64, k, c int) Crossing {
	m := ms.m
	g := ms.groups[len(m.net.Traces)+c]
	ms.open(g[0])
	ms.tips[c] = tipState{lo: 0, hi: 0, stopped: [2]bool{true, len(g) == 1}, source: ms.tips[c].source}
	ms.resizeConduit(c)
	cd := m.conduits[c]
	tr := m.net.Traces[cd.Source]
	angle := mapAngle(cd.directionAt(0), r2.Sub(tr.P1, tr.P0))
	return Crossing{Time: t, Stage: k, Conduit: c, Trace: cd.Source, Fracture: tr.Fracture,
		X: cd.P0.X, Y: cd.P0.Y, Angle: angle, Outcome: Reinitiated}
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
