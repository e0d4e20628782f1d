package sim

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/elastic"
	"slipfront/flow"
	"slipfront/internal/badinput"
	"slipfront/internal/orient"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// Conduit is a primary conduit: a vertical planar feature of fixed
// aperture from one perforation cluster, striking along SHmax, or a
// branch where a growing fracture may re-initiate at the end of a natural
// fracture it stopped at (growth.go).
type Conduit struct {
	Stage   int // index in the pumping order
	Cluster int // index in the stage's cluster list (a branch: its parent's)
	P0, P1  r2.Vec
	// Aperture and Height, m.
	Aperture, Height float64
	// Length from P0 to P1 as set, m (2·conduit_half_length for a
	// cluster's; |P1 − P0| but for rounding).
	Length float64
	// Source is, for a branch, the index in Network.Traces of the natural
	// fracture at whose end (P0) it starts; −1 for a cluster's conduit.
	Source int
	// Via are the interior vertices of a conduit that turns (path.go): it
	// runs P0, Via…, P1; nil for a straight one.
	Via []r2.Vec
	// key names a branch (growth.go).
	key branchKey
}

// IsBranch reports whether the conduit is a re-initiation branch.
func (cd Conduit) IsBranch() bool { return cd.Source >= 0 }

// Element is one flow element as the simulation sees it.
type Element struct {
	// Trace is the index in Network.Traces; −1 for a conduit element.
	Trace int
	// Fracture is the index in Network.Fractures; −1 for a conduit.
	Fracture int
	// Set of the fracture (dfn.KnownSet for mapped ones; −2 for conduits).
	Set int
	// P0, P1 are the ends in local metres; Length and Height in m.
	P0, P1         r2.Vec
	Length, Height float64
}

// elasticElements returns the elements as the elastic operator sees them.
func elasticElements(els []Element) []elastic.Element {
	out := make([]elastic.Element, len(els))
	for i, el := range els {
		out[i] = elastic.Element{P0: el.P0, P1: el.P1, Height: el.Height}
	}
	return out
}

// ConduitSet marks conduit elements in Element.Set.
const ConduitSet = -2

// model is everything fixed during a run.
type model struct {
	s        *scenarios.Scenario
	net      *dfn.Network
	mesh     *flow.Mesh
	elements []Element
	conduits []Conduit
	order    []scenarios.PlannedStage
	// wellNodes[k] are the mesh nodes fed by stage k's clusters, and
	// clusterNodes[k][c] those fed by its cluster c (a node fed by two
	// clusters goes to the first).
	wellNodes    [][]int
	clusterNodes [][][]int
	// Per element: the in-situ total normal stress σn, compression-positive,
	// and shear traction τ, signed as package elastic's Δτ (positive drives
	// right-lateral slip), Pa; the crack that opens it (its trace, or the
	// whole conduit); and its group (trace, or conduit after the traces).
	sigmaN, tau0 []float64
	openPatch    []mechanics.Patch
	group        []int
	friction     mechanics.SlipWeakening
	aperture     mechanics.ApertureModel
	stress       mechanics.Stress
	shmin        float64 // Pa, for the tensile-regime warning
	p0           float64 // initial pore pressure before any production, Pa
	// depletion is the state production left (nil for none); then
	// pInit holds each element's pore pressure at the start, Pa.
	depletion *Depletion
	pInit     []float64
	grid      scenarios.Grid
	conduitEl []bool
}

// newModel builds the mesh (traces, conduits, junctions, well cuts), the
// stage wells and the stresses on every element.
func newModel(s *scenarios.Scenario, net *dfn.Network, plan *pathPlan) (*model, error) {
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return nil, badinput.Mark(err)
	}
	friction, err := mechanics.FrictionFromScenario(s.Rock)
	if err != nil {
		return nil, badinput.Mark(err)
	}
	ap, err := mechanics.ApertureFromScenario(s.Rock)
	if err != nil {
		return nil, badinput.Mark(err)
	}
	m := &model{s: s, net: net, order: s.PumpingOrder(), friction: friction, aperture: ap, stress: stress,
		p0: stress.PorePressure(), grid: s.MapGrid()}
	for _, p := range stress.Principal() {
		if p.Name == "Shmin" {
			m.shmin = p.Value
		}
	}
	if m.depletion, err = Deplete(s); err != nil {
		return nil, err
	}
	paths, junctions := m.paths(plan)
	if n := estimateElements(paths, s.Numerics.ElementLength); n > MaxElements {
		return nil, badinput.Errorf("numerics.element_length = %g m would split the %d traces and conduits into about %.3g elements; at most %d are allowed: use longer elements or a smaller map",
			s.Numerics.ElementLength, len(paths), n, MaxElements)
	}
	clusterNodes, err := m.clusterCuts(paths)
	if err != nil {
		return nil, err
	}
	m.mesh, err = flow.BuildMesh(paths, junctions, flow.MeshSettings{ElementLength: s.Numerics.ElementLength})
	if err != nil {
		return nil, err
	}
	m.wellNodes = make([][]int, len(m.order))
	m.clusterNodes = make([][][]int, len(m.order))
	for k, feeds := range clusterNodes {
		st := m.order[k]
		m.clusterNodes[k] = make([][]int, len(s.Wells[st.Well].Stages[st.Stage].Clusters))
		for _, f := range feeds {
			node := m.mesh.Node(f.path, f.frac)
			if slices.Contains(m.wellNodes[k], node) {
				continue
			}
			m.wellNodes[k] = append(m.wellNodes[k], node)
			m.clusterNodes[k][f.cluster] = append(m.clusterNodes[k][f.cluster], node)
		}
	}
	if err := m.elementStresses(stress); err != nil {
		return nil, err
	}
	return m, nil
}

// initialPressure is element i's pore pressure at the start of the
// stimulation, Pa.
func (m *model) initialPressure(i int) float64 {
	if m.pInit != nil {
		return m.pInit[i]
	}
	return m.p0
}

// stressAt is the stress state at the local point p at the start of the
// stimulation: the in-situ state, changed by the depletion there if the
// parents produced (a state Changed rejected at an element is caught when
// the model is built, so the in-situ state stands in for it here).
func (m *model) stressAt(p r2.Vec) mechanics.Stress {
	if m.depletion == nil {
		return m.stress
	}
	if s, err := m.stress.Changed(m.depletion.At(p)); err == nil {
		return s
	}
	return m.stress
}

// shmaxAzimuth is the azimuth of SHmax at the local point p at the start
// of the stimulation, radians: the in-situ one, turned by the depletion's
// stress change there if the parents produced.
func (m *model) shmaxAzimuth(p r2.Vec) float64 {
	if m.depletion == nil {
		return m.s.Stress.SHmaxAzimuth
	}
	return m.stress.Horizontal().Changed(m.depletion.At(p)).Azimuth
}

// paths lists the natural traces, then one conduit per cluster when the
// well has conduits, striking along the local SHmax or through the
// headings of plan (path.go; nil for straight conduits), then the branches
// of growing conduits (growth.go: branches), and their junctions.
func (m *model) paths(plan *pathPlan) ([]flow.Path, []flow.Junction) {
	net := m.net
	nt := len(net.Traces)
	paths := make([]flow.Path, 0, nt)
	for _, t := range net.Traces {
		paths = append(paths, flow.Path{P0: t.P0, P1: t.P1, Height: t.Height})
	}
	junctions := make([]flow.Junction, 0, len(net.Intersections))
	for _, x := range net.Intersections {
		junctions = append(junctions, flow.Junction{A: x.I, B: x.J, SA: x.SI, SB: x.SJ})
	}
	for k, st := range m.order {
		w := m.s.Wells[st.Well]
		if w.ConduitHalfLength <= 0 {
			continue
		}
		h := w.ConduitHeight
		if h == 0 {
			h = m.s.Layer.Thickness
		}
		for c, at := range w.Stages[st.Stage].Clusters {
			centre := PointAlong(net.Wells[st.Well].Path, at)
			strike := orient.Line(m.shmaxAzimuth(centre), 0)
			dir := r2.Vec{X: strike.X, Y: strike.Y}
			cd := Conduit{Stage: k, Cluster: c, Aperture: w.ConduitAperture, Height: h, Length: 2 * w.ConduitHalfLength, Source: -1}
			var headings [2][]heading
			if plan != nil && len(m.conduits) < len(plan.clusters) {
				headings = plan.clusters[len(m.conduits)]
			}
			cd.P0, cd.P1, cd.Via = m.clusterConduitPath(centre, dir, w.ConduitHalfLength, headings)
			m.conduits = append(m.conduits, cd)
			path := conduitPath(cd)
			path.Cuts = []float64{0.5}
			paths = append(paths, path)
		}
	}
	if len(m.conduits) == 0 {
		return paths, junctions
	}
	segs := make([]dfn.Segment, nt)
	for i, t := range net.Traces {
		segs[i] = t.Segment
	}
	ix := dfn.NewIndex(segs)
	seen, highest := map[branchKey]bool{}, m.highestPressure()
	// m.conduits grows as branches are found; each is crossed in turn.
	for c := 0; c < len(m.conduits); c++ {
		cd := m.conduits[c]
		length := cd.Length
		for _, x := range ix.CrossPolyline(cd.points()) {
			if x.Segment == cd.Source {
				continue // where a branch starts
			}
			t := net.Traces[x.Segment]
			junctions = append(junctions, flow.Junction{A: nt + c, B: x.Segment,
				SA: x.Distance / length, SB: r2.Norm(r2.Sub(x.Point, t.P0)) / t.Length})
			for _, br := range m.branches(seen, c, x, highest, plan) {
				m.conduits = append(m.conduits, br)
				paths = append(paths, conduitPath(br))
				end := 0.0
				if br.P0 != t.P0 {
					end = 1
				}
				junctions = append(junctions, flow.Junction{A: len(paths) - 1, B: x.Segment, SA: 0, SB: end})
			}
		}
	}
	return paths, junctions
}

// MaxElements caps the flow elements of a run (about 10⁹ bytes of state
// and factor), so an element length typed in the wrong unit fails with a
// clear error instead of exhausting memory.
const MaxElements = 5_000_000

// estimateElements is the number of elements the paths split into,
// without the extra boundaries at junctions.
func estimateElements(paths []flow.Path, elementLength float64) float64 {
	var n float64
	for _, p := range paths {
		n += math.Ceil(r2.Norm(r2.Sub(p.P1, p.P0)) / elementLength)
	}
	return n
}

// feed is a position on a path fed by a perforation cluster (its index in
// the stage).
type feed struct {
	path    int
	frac    float64
	cluster int
}

// clusterCuts finds, for every stage, the path positions its clusters
// feed: the midpoint of each cluster's conduit, and every trace the well
// path crosses within the perforation reach of a cluster. It adds those
// positions to the paths' cuts so that they become nodes.
func (m *model) clusterCuts(paths []flow.Path) ([][]feed, error) {
	feeds := make([][]feed, len(m.order))
	for i, cd := range m.conduits {
		if cd.IsBranch() {
			continue // fed by its natural fracture
		}
		// Conduit i is path len(traces)+i, cut at its midpoint.
		feeds[cd.Stage] = append(feeds[cd.Stage], feed{path: len(m.net.Traces) + i, frac: 0.5, cluster: cd.Cluster})
	}
	for k, st := range m.order {
		w := m.s.Wells[st.Well]
		for _, x := range m.net.WellCrossings {
			if x.Well != st.Well {
				continue
			}
			for c, at := range w.Stages[st.Stage].Clusters {
				if math.Abs(x.Distance-at) <= w.PerforationReach {
					t := m.net.Traces[x.Trace]
					f := r2.Norm(r2.Sub(x.Point, t.P0)) / t.Length
					paths[x.Trace].Cuts = append(paths[x.Trace].Cuts, f)
					feeds[k] = append(feeds[k], feed{path: x.Trace, frac: f, cluster: c})
					break
				}
			}
		}
		if len(feeds[k]) == 0 {
			return nil, badinput.Errorf("stage %s: its clusters meet no fracture within the perforation reach (%.3g m) and the well has no primary conduits; widen wells[%d].perforation_reach or set wells[%d].conduit_half_length",
				st.Name, w.PerforationReach, st.Well, st.Well)
		}
	}
	return feeds, nil
}

// elementStresses fills the per-element view and resolves the in-situ
// stress on each element: natural elements carry the normal and shear
// stress resolved on their fracture's plane (dipping or not), the shear
// signed by its component along the trace, which is the direction the map
// plane lets it slip; conduits, vertical, carry the horizontal stress on
// their plane. After production each element takes the stress and pore
// pressure of the depleted field at its centre.
func (m *model) elementStresses(stress mechanics.Stress) error {
	nt := len(m.net.Traces)
	n := len(m.mesh.Elements)
	m.elements = make([]Element, n)
	m.sigmaN, m.tau0 = make([]float64, n), make([]float64, n)
	m.openPatch = make([]mechanics.Patch, n)
	m.group = make([]int, n)
	m.conduitEl = make([]bool, n)
	resolved := map[int]mechanics.PlaneStress{}
	if m.depletion != nil {
		m.pInit = make([]float64, n)
	}
	for i, el := range m.mesh.Elements {
		e := Element{Trace: -1, Fracture: -1, Set: ConduitSet, P0: el.P0, P1: el.P1, Length: el.Length, Height: el.Height}
		m.group[i] = el.Path
		local := stress
		if m.depletion != nil {
			var err error
			if local, err = stress.Changed(m.depletion.At(el.Centre())); err != nil {
				return badinput.Errorf("the depleted stress at (%.1f, %.1f) m: %v", el.Centre().X, el.Centre().Y, err)
			}
			m.pInit[i] = local.PorePressure()
		}
		strikeShear, horizontalNormal := horizontalTractions(local, el.P0, el.P1)
		if el.Path < nt {
			t := m.net.Traces[el.Path]
			e.Trace, e.Fracture, e.Set = el.Path, t.Fracture, t.Set
			ps, ok := resolved[t.Fracture]
			if !ok || m.depletion != nil {
				ps = local.Resolve(m.net.Fractures[t.Fracture].Normal)
				resolved[t.Fracture] = ps
			}
			m.sigmaN[i], m.tau0[i] = ps.SigmaN, math.Copysign(ps.Tau, strikeShear)
			m.openPatch[i] = mechanics.Patch{Length: t.Length, Height: t.Height}
		} else {
			c := m.conduits[el.Path-nt]
			m.conduitEl[i] = true
			m.sigmaN[i], m.tau0[i] = horizontalNormal, strikeShear
			m.openPatch[i] = mechanics.Patch{Length: conduitPath(c).Length(), Height: c.Height}
		}
		m.elements[i] = e
	}
	return nil
}

// horizontalTractions returns the in-situ shear traction along the
// segment p0→p1 of a vertical plane, signed as package elastic's Δτ
// (−t·S·n with t the unit tangent and n = (−t_y, t_x): positive drives
// right-lateral slip), and the normal stress n·S·n, Pa, from the
// horizontal block of the East-North-Up stress tensor.
func horizontalTractions(stress mechanics.Stress, p0, p1 r2.Vec) (shear, normal float64) {
	s := stress.Tensor()
	t := r2.Unit(r2.Sub(p1, p0))
	n := r2.Vec{X: -t.Y, Y: t.X}
	sn := r2.Vec{X: s[0][0]*n.X + s[0][1]*n.Y, Y: s[1][0]*n.X + s[1][1]*n.Y}
	return -r2.Dot(t, sn), r2.Dot(n, sn)
}

// PointAlong returns the point at distance d along a polyline.
func PointAlong(path []r2.Vec, d float64) r2.Vec {
	for i := 1; i < len(path); i++ {
		leg := r2.Norm(r2.Sub(path[i], path[i-1]))
		if leg == 0 {
			continue
		}
		if d <= leg || i == len(path)-1 {
			return r2.Add(path[i-1], r2.Scale(math.Min(d, leg)/leg, r2.Sub(path[i], path[i-1])))
		}
		d -= leg
	}
	return path[len(path)-1]
}
