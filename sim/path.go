package sim

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
	"slipfront/flow"
	"slipfront/internal/orient"
	"slipfront/mechanics"
)

// Curved paths. A growing fracture turns where the stress shadows of the
// other fractures turn the horizontal stress: each new element of its path
// should strike along the local SHmax of the stress at that element, the
// in-situ stress plus the change that the slip and opening of every other
// fracture cause there, at the time the tip reaches it. That is the
// principle of local symmetry (Goldstein & Salganik 1974, Int. J. Fract.
// 10(4), 507–523; from memory): a crack grows where its tip is loaded in
// pure mode I, K_II = 0. The maximum circumferential stress criterion
// (Erdogan & Sih 1963, J. Basic Eng. 85, 519–527: K_I sin θ +
// K_II(3 cos θ − 1) = 0) kinks the tip by θ ≈ −2K_II/K_I, which removes
// K_II after each short increment, so it draws the same path in the limit
// of short elements (from memory). The fracture's own opening is left out
// of that stress: ahead of its tip it is the mode-I field, which turns
// nothing.
//
// The elements are meshed before the run, so the path cannot bend while
// the run goes on. Instead a run with numerics.path_passes = n > 1 is n
// runs on one network: the first meshes every conduit straight along the
// local SHmax at its cluster (before injection); each run records, at
// every element a tip opens, the direction of the local SHmax there
// (a heading), and the next run meshes each cluster's conduit through the
// headings its tips recorded (continuing straight in the last one beyond
// the farthest), and each branch (growth.go), known by its natural
// fracture, end and sense, through those its tip recorded. From the third
// run on, the headings are turned only part of the way from the paths to
// what the tips met, by Aitken's factor of the two runs before
// (relaxPlan), so passes whose turns alternate converge. Each run
// records its frames over the one before's, and the last run's result is
// the outputs (one interrupted before ends the passes with its own, see
// Run). Each run reports its turns, the angles between the
// elements its tips opened and the headings met there (Result.PathPasses):
// as the passes converge the turns of the last pass tend to zero, and the
// README's convergence table shows the headline numbers over the passes.

// heading is the direction a tip travelling outward from its cluster met
// where it opened an element: the local SHmax there as a unit map vector
// pointing the way the tip travels, and the distance of the element's
// centre from the cluster along the path, m.
type heading struct {
	s   float64
	dir r2.Vec
	// path is the direction of the element the tip opened there, and turn
	// the signed angle from it to dir, radians (relaxPlan).
	path r2.Vec
	turn float64
}

// pathPlan holds the headings the tips of one run met, by increasing s:
// for each cluster's conduit (the first conduits, in their order) on each
// side (side 0 travels towards P0, side 1 towards P1, from the cluster),
// and for each branch, from its start.
type pathPlan struct {
	clusters [][2][]heading
	branches map[branchKey][]heading
}

// PathPass sums up the turns of one run of the path passes: the angles
// between the elements the tips opened and the headings met there.
type PathPass struct {
	// Advances counts the elements opened by a tip.
	Advances int
	// MaxTurn and RMSTurn are the largest and the root-mean-square turn,
	// radians (0 when nothing advanced).
	MaxTurn, RMSTurn float64
	// MaxOffset is the largest distance of an element a tip opened from
	// the straight line along the local SHmax through its cluster (a
	// branch's start), m: how far the pass's paths turned.
	MaxOffset float64
}

// pathPasses is the number of runs that set the paths: numerics.path_passes
// when some fracture grows and the fractures interact, otherwise 1 (no
// shadow turns a path).
func pathPasses(m *model) int {
	if m.s.Numerics.Interaction == "off" || !m.anyGrowth() {
		return 1
	}
	return max(1, m.s.Numerics.PathPasses)
}

// clusterConduitPath returns the path of a cluster's conduit centred at
// centre with half-length half and straight direction dir (unit, towards
// P1): straight, or through the headings of plan (see pathSide).
func (m *model) clusterConduitPath(centre, dir r2.Vec, half float64, plan [2][]heading) (p0, p1 r2.Vec, via []r2.Vec) {
	if len(plan[0]) == 0 && len(plan[1]) == 0 {
		return r2.Sub(centre, r2.Scale(half, dir)), r2.Add(centre, r2.Scale(half, dir)), nil
	}
	back := m.pathSide(centre, r2.Scale(-1, dir), half, plan[0])
	out := m.pathSide(centre, dir, half, plan[1])
	// P0 is the far end of side 0; the polyline runs back to the centre
	// and out along side 1.
	n := len(back)
	for k := n - 2; k >= 0; k-- {
		via = append(via, back[k])
	}
	via = append(via, centre)
	via = append(via, out[:len(out)-1]...)
	return back[n-1], out[len(out)-1], via
}

// branchPath returns the path of a branch from start, length long with
// straight direction dir (unit): straight, or through the headings of
// plan (see pathSide).
func (m *model) branchPath(start, dir r2.Vec, length float64, plan []heading) (p1 r2.Vec, via []r2.Vec) {
	if len(plan) == 0 {
		return r2.Add(start, r2.Scale(length, dir)), nil
	}
	pts := m.pathSide(start, dir, length, plan)
	return pts[len(pts)-1], pts[:len(pts)-1]
}

// pathSide returns the vertices after from of a path length long
// travelling from it: one leg per element (length/⌈length/element_length⌉),
// each striking along the heading of the farthest element whose centre
// lies before the leg's end, or along out (unit) before the first.
func (m *model) pathSide(from, out r2.Vec, length float64, plan []heading) []r2.Vec {
	n := max(1, int(math.Ceil(length/m.s.Numerics.ElementLength-1e-9)))
	leg := length / float64(n)
	pts := make([]r2.Vec, 0, n)
	at, h := from, 0
	for k := range n {
		mid := (float64(k) + 0.5) * leg
		for h < len(plan) && plan[h].s <= mid+leg/2 {
			h++
		}
		d := out
		if h > 0 {
			d = plan[h-1].dir
		}
		at = r2.Add(at, r2.Scale(leg, d))
		pts = append(pts, at)
	}
	return pts
}

// pathRecorder records the headings of a run (see the top of this file).
type pathRecorder struct {
	probe *elastic.Probe
	plan  *pathPlan
	// slip and opening are the work copies of the state the probe reads.
	slip, opening []float64
	// arcMid is each element's centre as a distance along its group, m.
	arcMid []float64
	pass   PathPass
	sum2   float64
}

// newPathRecorder returns the recorder of a run of model m.
func newPathRecorder(m *model) (*pathRecorder, error) {
	mat := elastic.Material{ShearModulus: m.s.Rock.ShearModulus, PoissonRatio: m.s.Rock.PoissonRatio}
	probe, err := elastic.NewProbe(elasticElements(m.elements), mat, elastic.Settings{PlaneStrain: m.s.Numerics.HeightCorrection == "off"})
	if err != nil {
		return nil, err
	}
	n := len(m.elements)
	clusters := 0 // the clusters' conduits come first, the branches after
	for clusters < len(m.conduits) && !m.conduits[clusters].IsBranch() {
		clusters++
	}
	plan := &pathPlan{clusters: make([][2][]heading, clusters), branches: map[branchKey][]heading{}}
	return &pathRecorder{probe: probe, plan: plan,
		slip: make([]float64, n), opening: make([]float64, n)}, nil
}

// record notes the heading met at element j, opened by the tip of
// conduit c travelling from element i, under the committed state of ms.
func (pr *pathRecorder) record(ms *mechState, c, i, j int) {
	m := ms.m
	group := ms.groups[len(m.net.Traces)+c]
	if pr.arcMid == nil {
		pr.arcMid = make([]float64, len(m.elements))
		for _, g := range ms.groups {
			var s float64
			for _, e := range g {
				pr.arcMid[e] = s + m.elements[e].Length/2
				s += m.elements[e].Length
			}
		}
	}
	copy(pr.slip, ms.state.Slip)
	copy(pr.opening, ms.opening)
	for _, e := range group {
		pr.slip[e], pr.opening[e] = 0, 0 // the fracture's own field turns nothing
	}
	el := m.elements[j]
	at := r2.Scale(0.5, r2.Add(el.P0, el.P1))
	ds := pr.probe.StressAt(at, pr.slip, pr.opening)
	if math.IsNaN(ds.XX+ds.YY+ds.XY) || math.IsInf(ds.XX+ds.YY+ds.XY, 0) {
		return // a point on another element's tip: no heading there
	}
	az := m.stressAt(at).Horizontal().Changed(mechanics.StressChange{XX: ds.XX, YY: ds.YY, XY: ds.XY}).Azimuth
	local := orient.Line(az, 0)
	dir := r2.Vec{X: local.X, Y: local.Y}
	from := m.elements[i]
	travel := r2.Sub(at, r2.Scale(0.5, r2.Add(from.P0, from.P1)))
	if r2.Dot(dir, travel) < 0 {
		dir = r2.Scale(-1, dir)
	}
	cd := m.conduits[c]
	origin := cd.P0 // a branch grows from P0
	// The element's direction the way the tip travels, and the signed
	// turn from it to the heading met.
	seg := r2.Sub(el.P1, el.P0)
	forward := r2.Dot(travel, seg)
	along := r2.Unit(seg)
	if forward < 0 {
		along = r2.Scale(-1, along)
	}
	signed := math.Atan2(along.X*dir.Y-along.Y*dir.X, r2.Dot(along, dir))
	if cd.IsBranch() {
		pr.plan.branches[cd.key] = append(pr.plan.branches[cd.key], heading{s: pr.arcMid[j], dir: dir, path: along, turn: signed})
	} else {
		side := 0
		if forward > 0 {
			side = 1 // travelling as the path runs, towards P1
		}
		s := math.Abs(pr.arcMid[j] - ms.groupLength[len(m.net.Traces)+c]/2)
		pr.plan.clusters[c][side] = append(pr.plan.clusters[c][side], heading{s: s, dir: dir, path: along, turn: signed})
		origin = cd.centre()
	}
	turn := math.Min(math.Abs(signed), math.Pi-math.Abs(signed)) // between the lines
	strike := orient.Line(m.shmaxAzimuth(origin), 0)
	off := r2.Sub(at, origin)
	pr.pass.MaxOffset = math.Max(pr.pass.MaxOffset, math.Abs(off.X*strike.Y-off.Y*strike.X))
	pr.pass.Advances++
	pr.pass.MaxTurn = math.Max(pr.pass.MaxTurn, turn)
	pr.sum2 += turn * turn
}

// result returns the pass's summary.
func (pr *pathRecorder) result() PathPass {
	p := pr.pass
	if p.Advances > 0 {
		p.RMSTurn = math.Sqrt(pr.sum2 / float64(p.Advances))
	}
	return p
}

// conduitPath returns the flow path of conduit cd.
func conduitPath(cd Conduit) flow.Path {
	return flow.Path{P0: cd.P0, P1: cd.P1, Via: cd.Via, Height: cd.Height}
}

// points returns the polyline of conduit cd: P0, Via…, P1.
func (cd Conduit) points() []r2.Vec {
	out := make([]r2.Vec, 0, len(cd.Via)+2)
	out = append(out, cd.P0)
	out = append(out, cd.Via...)
	return append(out, cd.P1)
}

// centre returns the cluster of a cluster's conduit cd: the middle of its
// path.
func (cd Conduit) centre() r2.Vec {
	if len(cd.Via) == 0 {
		return r2.Scale(0.5, r2.Add(cd.P0, cd.P1))
	}
	return cd.Via[len(cd.Via)/2]
}

// directionAt returns the unit direction, towards P1, of the leg of
// conduit cd at distance d along it from P0.
func (cd Conduit) directionAt(d float64) r2.Vec {
	pts := cd.points()
	for k := 1; k < len(pts); k++ {
		leg := r2.Norm(r2.Sub(pts[k], pts[k-1]))
		if d <= leg || k == len(pts)-1 {
			return r2.Unit(r2.Sub(pts[k], pts[k-1]))
		}
		d -= leg
	}
	return r2.Unit(r2.Sub(cd.P1, cd.P0))
}

// relaxPlan turns the headings of next, met in a pass whose paths the
// plan prev set (nil for straight paths), only part of the way from the
// elements' directions to what the tips met: by ω times each turn, with
// Aitken's factor (Irons & Tuck 1969; as flow relaxes its iterations)
// from the turns of the two passes matched heading by heading,
// ω_k = −ω_{k−1} Σ θ_{k−1}(θ_k − θ_{k−1}) / Σ (θ_k − θ_{k−1})², within
// [0.05, 1]; ω = 1 after the first pass. Passes whose turns alternate
// (a tip whose path moves the stress that turns it) then converge instead
// of oscillating. It returns the ω used.
func relaxPlan(prev, next *pathPlan, omega float64) float64 {
	if prev == nil {
		return 1
	}
	var num, den float64
	pair := func(a, b []heading) {
		for i := range min(len(a), len(b)) {
			d := b[i].turn - a[i].turn
			num += a[i].turn * d
			den += d * d
		}
	}
	for c := range min(len(prev.clusters), len(next.clusters)) {
		for side := range 2 {
			pair(prev.clusters[c][side], next.clusters[c][side])
		}
	}
	for key, hs := range next.branches {
		pair(prev.branches[key], hs)
	}
	if den > 0 {
		omega = math.Min(1, math.Max(0.05, -omega*num/den))
	}
	turn := func(hs []heading) {
		for i := range hs {
			h := &hs[i]
			a := omega * h.turn
			sin, cos := math.Sincos(a)
			h.dir = r2.Vec{X: h.path.X*cos - h.path.Y*sin, Y: h.path.X*sin + h.path.Y*cos}
		}
	}
	for c := range next.clusters {
		for side := range 2 {
			turn(next.clusters[c][side])
		}
	}
	for _, hs := range next.branches {
		turn(hs)
	}
	return omega
}
