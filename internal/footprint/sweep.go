package footprint

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"
)

// sweep holds the stadiums of one region (in coordinates relative to the
// region's centre) cut into vertical strips. Each strip is swept upward on
// its own: between two consecutive break heights (a slab) every clipped
// cross-section is one smooth piece, so the union of the cross-sections is
// a fixed set of intervals whose ends are known functions of y.
type sweep struct {
	r     float64
	st    []stadium
	lines []float64 // strip bounds: strip s is [lines[s], lines[s+1]]
	slack float64   // distance, m, within which a point counts as in a strip
	start []int     // entries of strip s are ent[start[s]:start[s+1]]
	ent   []entry
}

// entry is a stadium's part in one strip.
type entry struct {
	st     int32
	lo, hi float64 // y-range of the stadium within the strip
	// cov[0] and cov[1] are the y-ranges over which the stadium covers the
	// strip's left and right bounds (empty, +Inf…−Inf, where it does not
	// reach them). Both neighbouring strips use the same numbers, so they
	// agree on where the region crosses their common bound.
	cov [2][2]float64
}

// fnRef names an end function: a piece of a stadium, or a strip bound
// (clipLo, clipHi; st is then −1).
type fnRef struct {
	st   int32
	kind uint8
}

// cell is one maximal interval of the union in a slab: its end functions
// and their values at mid-slab.
type cell struct {
	lo, hi   fnRef
	xlo, xhi float64
}

// workspace is the scratch memory of one strip sweep.
type workspace struct {
	ev    []float64
	order []entry
	act   []entry
	pts   []r2.Vec
	iv    []cell
	cells []cell
}

var empty = [2]float64{math.Inf(1), math.Inf(-1)}

// newSweep cuts the stadiums into strips about as wide as the mean
// stadium (so a strip meets few stadiums at any height), at most 2n + 1
// strips. scale bounds the coordinates' magnitude.
func newSweep(st []stadium, r, scale float64) *sweep {
	sw := &sweep{r: r, st: st, slack: 1e-9 * scale}
	x0, x1, mean := math.Inf(1), math.Inf(-1), 0.0
	for i := range st {
		x0, x1 = min(x0, st[i].xmin), max(x1, st[i].xmax)
		mean += (st[i].xmax - st[i].xmin) / float64(len(st))
	}
	n := 1
	if len(st) > 0 {
		n = int(max(1, min(float64(2*len(st)+1), math.Round((x1-x0)/mean))))
	}
	sw.lines = make([]float64, n+1)
	for k := range sw.lines {
		sw.lines[k] = x0 + (x1-x0)*float64(k)/float64(n)
	}
	sw.lines[n] = x1
	sw.fill()
	return sw
}

// strip returns the strip that holds x (the last one for its right
// bound), consistent with the stored bounds.
func (sw *sweep) strip(x float64) int {
	n := len(sw.lines) - 1
	w := (sw.lines[n] - sw.lines[0]) / float64(n)
	s := 0
	if w > 0 {
		s = int(max(0, min(float64(n-1), math.Floor((x-sw.lines[0])/w))))
	}
	for s > 0 && x < sw.lines[s] {
		s--
	}
	for s < n-1 && x >= sw.lines[s+1] {
		s++
	}
	return s
}

// fill builds the per-strip entries in two passes (count, then place).
func (sw *sweep) fill() {
	n := len(sw.lines) - 1
	sw.start = make([]int, n+1)
	for i := range sw.st {
		for s := sw.strip(sw.st[i].xmin); s <= sw.strip(sw.st[i].xmax); s++ {
			sw.start[s+1]++
		}
	}
	for s := range n {
		sw.start[s+1] += sw.start[s]
	}
	sw.ent = make([]entry, sw.start[n])
	next := slices.Clone(sw.start[:n])
	var key []r2.Vec
	for i := range sw.st {
		s0, s1 := sw.strip(sw.st[i].xmin), sw.strip(sw.st[i].xmax)
		key = sw.st[i].keyPoints(key[:0], sw.r)
		for s := s0; s <= s1; s++ {
			sw.ent[next[s]] = sw.entryOf(int32(i), s, s0, s1, key[:4])
			next[s]++
		}
	}
}

// entryOf returns stadium i's entry in strip s (of its strips s0…s1); ext
// holds its bottom, top, leftmost and rightmost points. The y-range within
// the strip is the extent of the lower and upper boundaries over the
// strip's x-range: both are convex (concave) functions of x, so their
// extremes are at the extreme points or at the strip bounds.
func (sw *sweep) entryOf(i int32, s, s0, s1 int, ext []r2.Vec) entry {
	st := &sw.st[i]
	e := entry{st: i, lo: math.Inf(1), hi: math.Inf(-1), cov: [2][2]float64{empty, empty}}
	for side, ok := range [2]bool{s > s0, s < s1} {
		if ok {
			lo, hi := st.column(sw.r, sw.lines[s+side])
			e.cov[side] = [2]float64{lo, hi}
			e.lo, e.hi = min(e.lo, lo), max(e.hi, hi)
		}
	}
	for _, p := range ext {
		if sw.inStrip(p.X, s) {
			e.lo, e.hi = min(e.lo, p.Y), max(e.hi, p.Y)
		}
	}
	return e
}

// inStrip reports whether x lies in strip s, within the slack.
func (sw *sweep) inStrip(x float64, s int) bool {
	return x >= sw.lines[s]-sw.slack && x <= sw.lines[s+1]+sw.slack
}

// visitor receives each slab [y0, y1] of a strip, bottom to top, with the
// union's maximal intervals in increasing x (none where the strip is
// empty at that height).
type visitor func(y0, y1 float64, cells []cell)

// run sweeps strip s. Intervals closer than gap merge (0 for the area).
func (sw *sweep) run(s int, ws *workspace, gap float64, visit visitor) {
	ents := sw.ent[sw.start[s]:sw.start[s+1]]
	if len(ents) == 0 {
		return
	}
	ws.order = append(ws.order[:0], ents...)
	slices.SortFunc(ws.order, func(a, b entry) int { return cmpFloat(a.lo, b.lo) })
	ws.ev = sw.breaks(s, ws)
	x0, x1 := sw.lines[s], sw.lines[s+1]
	next := 0
	ws.act = ws.act[:0]
	for k := 0; k+1 < len(ws.ev); k++ {
		// Which stadiums are in the slab, and which cover a strip bound,
		// is decided from the slab's bounds (break heights themselves), not
		// from its middle, which rounds onto a bound in a slab one float
		// step high.
		y0, y1 := ws.ev[k], ws.ev[k+1]
		for next < len(ws.order) && ws.order[next].lo <= y0 {
			ws.act = append(ws.act, ws.order[next])
			next++
		}
		ws.iv = ws.iv[:0]
		kept := ws.act[:0]
		for _, e := range ws.act {
			if e.hi < y1 {
				continue
			}
			kept = append(kept, e)
			if c, ok := sw.clip(e, x0, x1, y0, y1); ok {
				ws.iv = append(ws.iv, c)
			}
		}
		ws.act = kept
		visit(y0, y1, mergeCells(ws, gap))
	}
}

// breaks returns the sorted distinct break heights of strip s: the ends of
// every entry, where stadiums cross the strip bounds, their tangent
// points in the strip, and the crossings of every two stadium boundaries
// in the strip. ws.order must hold the strip's entries sorted by lo.
//
// A tangent point or a crossing strictly inside a third stadium is left
// out: the union's maximal intervals can change only where their ends
// meet, change piece or leave the strip, all on the union's boundary, so a
// break height inside the union changes nothing but the order of ends
// that are hidden. The third stadium is looked for among the entries open
// at the time (a cheap, partial search: a point it misses stays).
func (sw *sweep) breaks(s int, ws *workspace) []float64 {
	ev := ws.ev[:0]
	var key [8]r2.Vec
	ws.act = ws.act[:0]
	for _, e := range ws.order {
		ev = append(ev, e.lo, e.hi)
		for _, c := range e.cov {
			if c[0] <= c[1] {
				ev = append(ev, c[0], c[1])
			}
		}
		// Pairs of entries whose y-ranges overlap: a sweep over lo with
		// the list of entries still open.
		ws.act = slices.DeleteFunc(ws.act, func(a entry) bool { return a.hi < e.lo })
		for _, p := range sw.st[e.st].keyPoints(key[:0], sw.r)[4:] {
			if sw.inStrip(p.X, s) && !sw.hidden(p, ws.act, e.st, e.st) {
				ev = append(ev, p.Y)
			}
		}
		t := &sw.st[e.st]
		for _, a := range ws.act {
			u := &sw.st[a.st]
			if u.xmax < t.xmin || t.xmax < u.xmin || u.ymax < t.ymin || t.ymax < u.ymin {
				continue
			}
			ws.pts = boundaryCrossings(ws.pts[:0], u, t, sw.r)
			for _, p := range ws.pts {
				if sw.inStrip(p.X, s) && !sw.hidden(p, ws.act, a.st, e.st) {
					ev = append(ev, p.Y)
				}
			}
		}
		ws.act = append(ws.act, e)
	}
	slices.Sort(ev)
	return slices.Compact(ev)
}

// hidden reports whether p lies inside one of the stadiums of open (other
// than i and j) by more than onBoundary·r.
func (sw *sweep) hidden(p r2.Vec, open []entry, i, j int32) bool {
	lim := sw.r * sw.r * (1 - 4*onBoundary)
	for _, k := range open {
		st := &sw.st[k.st]
		if k.st == i || k.st == j || p.X <= st.xmin || p.X >= st.xmax || p.Y <= st.ymin || p.Y >= st.ymax {
			continue
		}
		if st.dist2(p) < lim {
			return true
		}
	}
	return false
}

// clip returns the cross-section of entry e in the slab [y0, y1] (at its
// middle) clipped to the strip [x0, x1], and whether it is non-empty.
// Where the stadium covers a strip bound over the slab by the entry's
// shared ranges, that end is the bound and the interval exists even if the
// other end, computed from its own formula, rounds past the bound: the
// neighbouring strip sees the same coverage, so the two agree on where the
// region crosses their common bound.
func (sw *sweep) clip(e entry, x0, x1, y0, y1 float64) (cell, bool) {
	st := &sw.st[e.st]
	var c cell
	y := 0.5 * (y0 + y1)
	if y >= y1 {
		y = y0
	}
	inLo := e.cov[0][0] <= y0 && y1 <= e.cov[0][1]
	inHi := e.cov[1][0] <= y0 && y1 <= e.cov[1][1]
	if inLo {
		c.lo, c.xlo = fnRef{st: -1, kind: clipLo}, x0
	} else {
		k := st.pieceAt(0, sw.r, y)
		c.lo, c.xlo = fnRef{st: e.st, kind: k}, max(x0, st.value(k, sw.r, y))
	}
	if inHi {
		c.hi, c.xhi = fnRef{st: -1, kind: clipHi}, x1
	} else {
		k := st.pieceAt(1, sw.r, y)
		c.hi, c.xhi = fnRef{st: e.st, kind: k}, min(x1, st.value(k, sw.r, y))
	}
	switch {
	case inHi:
		c.xlo = min(c.xlo, x1)
	case inLo:
		c.xhi = max(c.xhi, x0)
	}
	return c, inLo || inHi || c.xhi > c.xlo
}

// mergeCells sorts ws.iv by left end (insertion sort: a slab holds few
// intervals, nearly in the previous slab's order) and merges those that
// overlap or lie closer than gap into ws.cells. On a tie a strip bound
// wins over a stadium end clamped to it, so a cell ends at a strip bound
// exactly where some stadium covers the bound by the shared coverage,
// as the neighbouring strip sees it.
func mergeCells(ws *workspace, gap float64) []cell {
	iv := ws.iv
	for i := 1; i < len(iv); i++ {
		c, j := iv[i], i
		for ; j > 0; j-- {
			p := &iv[j-1]
			if !(c.xlo < p.xlo || (c.xlo == p.xlo && c.lo.kind == clipLo && p.lo.kind != clipLo)) {
				break
			}
			iv[j] = *p
		}
		iv[j] = c
	}
	cells := ws.cells[:0]
	for _, c := range iv {
		if n := len(cells); n > 0 && c.xlo <= cells[n-1].xhi+gap {
			if last := &cells[n-1]; c.xhi > last.xhi || (c.xhi == last.xhi && c.hi.kind == clipHi) {
				last.hi, last.xhi = c.hi, c.xhi
			}
			continue
		}
		cells = append(cells, c)
	}
	ws.cells = cells
	return cells
}

// integral returns ∫ (x(y) − x0) dy over [y0, y1] for end function f in
// the strip [x0, x1].
func (sw *sweep) integral(f fnRef, y0, y1, x0, x1 float64) float64 {
	switch f.kind {
	case clipLo:
		return 0
	case clipHi:
		return (x1 - x0) * (y1 - y0)
	}
	return sw.st[f.st].integral(f.kind, sw.r, y0, y1, x0)
}

// at returns the value of end function f at height y in strip [x0, x1].
func (sw *sweep) at(f fnRef, y, x0, x1 float64) float64 {
	switch f.kind {
	case clipLo:
		return x0
	case clipHi:
		return x1
	}
	return max(x0, min(x1, sw.st[f.st].value(f.kind, sw.r, y)))
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
