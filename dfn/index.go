package dfn

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"
)

// maxCellsPerSegment bounds the grid size: at most this many cells per
// segment (so memory stays O(N) for sparse networks).
const maxCellsPerSegment = 4

// Index is a uniform-grid spatial index of map-view segments. Each segment
// is listed in every cell its bounding box, grown by GeomTol, covers (so
// segments that meet within the tolerance share a cell); the cell side is the
// mean bounding-box size of the segments, but no smaller than needed to
// keep at most maxCellsPerSegment cells per segment. An Index is not safe
// for concurrent use by CrossPolyline (it keeps query scratch space).
type Index struct {
	segs []Segment
	box  []box
	x0   float64 // grid origin, m
	y0   float64
	h    float64 // cell side, m
	nx   int
	ny   int
	// start[c]..start[c+1] index items, the segments of cell c in
	// increasing order, each with its box (stored inline so a cell is
	// scanned from contiguous memory).
	start []int32
	items []item
	seen  []int32 // query stamps, one per segment
	stamp int32
}

type box struct{ minX, minY, maxX, maxY float64 }

type item struct {
	box
	seg int32
}

// boxOf returns the bounding box of s grown by GeomTol on every side.
func boxOf(s Segment) box {
	return box{
		minX: math.Min(s.P0.X, s.P1.X) - GeomTol, minY: math.Min(s.P0.Y, s.P1.Y) - GeomTol,
		maxX: math.Max(s.P0.X, s.P1.X) + GeomTol, maxY: math.Max(s.P0.Y, s.P1.Y) + GeomTol,
	}
}

// overlap reports whether boxes a and b overlap (touching counts).
func overlap(a, b box) bool {
	return a.minX <= b.maxX && b.minX <= a.maxX && a.minY <= b.maxY && b.minY <= a.maxY
}

// NewIndex indexes the segments (which it keeps, not copies).
func NewIndex(segs []Segment) *Index {
	ix := &Index{segs: segs, box: make([]box, len(segs)), nx: 1, ny: 1, h: 1}
	if len(segs) == 0 {
		ix.start = []int32{0, 0}
		return ix
	}
	all := box{math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)}
	var size float64
	for i, s := range segs {
		b := boxOf(s)
		ix.box[i] = b
		all.minX, all.minY = math.Min(all.minX, b.minX), math.Min(all.minY, b.minY)
		all.maxX, all.maxY = math.Max(all.maxX, b.maxX), math.Max(all.maxY, b.maxY)
		size += math.Max(b.maxX-b.minX, b.maxY-b.minY)
	}
	w, hgt := all.maxX-all.minX, all.maxY-all.minY
	h := size / float64(len(segs))
	h = math.Max(h, math.Sqrt(w*hgt/float64(maxCellsPerSegment*len(segs))))
	h = math.Max(h, math.Max(w, hgt)/4096) // at most 4096 cells a side
	if !(h > 0) {
		h = 1
	}
	ix.x0, ix.y0, ix.h = all.minX, all.minY, h
	ix.nx = int(w/h) + 1
	ix.ny = int(hgt/h) + 1
	ix.fill()
	return ix
}

// cellRange returns the cell columns and rows a box covers, clamped to
// the grid.
func (ix *Index) cellRange(b box) (i0, i1, j0, j1 int) {
	clamp := func(v float64, n int) int {
		k := int(math.Floor(v))
		return max(0, min(n-1, k))
	}
	return clamp((b.minX-ix.x0)/ix.h, ix.nx), clamp((b.maxX-ix.x0)/ix.h, ix.nx),
		clamp((b.minY-ix.y0)/ix.h, ix.ny), clamp((b.maxY-ix.y0)/ix.h, ix.ny)
}

// fill builds the cell lists in two passes (count, then place).
func (ix *Index) fill() {
	ix.start = make([]int32, ix.nx*ix.ny+1)
	for _, b := range ix.box {
		i0, i1, j0, j1 := ix.cellRange(b)
		for j := j0; j <= j1; j++ {
			for i := i0; i <= i1; i++ {
				ix.start[j*ix.nx+i+1]++
			}
		}
	}
	for c := 1; c < len(ix.start); c++ {
		ix.start[c] += ix.start[c-1]
	}
	ix.items = make([]item, ix.start[len(ix.start)-1])
	next := slices.Clone(ix.start[:len(ix.start)-1])
	for k, b := range ix.box {
		i0, i1, j0, j1 := ix.cellRange(b)
		for j := j0; j <= j1; j++ {
			for i := i0; i <= i1; i++ {
				c := j*ix.nx + i
				ix.items[next[c]] = item{box: b, seg: int32(k)}
				next[c]++
			}
		}
	}
}

// Intersections returns every pair of indexed segments that meet
// (IntersectSegments with the lower index first), sorted by (I, J). A
// pair is examined only in the cell that holds the lower-left corner of
// the overlap of the two (grown) bounding boxes, so it is found once.
func (ix *Index) Intersections() []Intersection {
	var out []Intersection
	for j := range ix.ny {
		for i := range ix.nx {
			c := j*ix.nx + i
			cell := ix.items[ix.start[c]:ix.start[c+1]]
			for p := range cell {
				ba, a := cell[p].box, cell[p].seg
				for q := p + 1; q < len(cell); q++ {
					bb, b := cell[q].box, cell[q].seg
					if !overlap(ba, bb) {
						continue
					}
					// cell(max(a, b)) = max(cell(a), cell(b)): the first
					// cell both segments are listed in.
					ci, _, cj, _ := ix.cellRange(box{minX: math.Max(ba.minX, bb.minX), minY: math.Max(ba.minY, bb.minY)})
					if ci != i || cj != j {
						continue
					}
					if x, ok := IntersectSegments(ix.segs[a], ix.segs[b]); ok {
						out = append(out, Intersection{I: int(a), J: int(b), Point: x.Point, SI: x.S, SJ: x.T})
					}
				}
			}
		}
	}
	return sortByPair(out, len(ix.segs))
}

// sortByPair sorts intersections by (I, J): a counting sort on I (n
// segments), then an insertion sort on J within each I (a handful each).
func sortByPair(xs []Intersection, n int) []Intersection {
	start := make([]int32, n+1)
	for _, x := range xs {
		start[x.I+1]++
	}
	for i := 1; i <= n; i++ {
		start[i] += start[i-1]
	}
	out := make([]Intersection, len(xs))
	next := slices.Clone(start[:n])
	for _, x := range xs {
		out[next[x.I]] = x
		next[x.I]++
	}
	for i := range n {
		run := out[start[i]:start[i+1]]
		for a := 1; a < len(run); a++ {
			for b := a; b > 0 && run[b].J < run[b-1].J; b-- {
				run[b], run[b-1] = run[b-1], run[b]
			}
		}
	}
	return out
}

// query calls fn once for each indexed segment whose grown bounding box
// overlaps the (grown) box b.
func (ix *Index) query(b box, fn func(k int)) {
	if len(ix.segs) == 0 {
		return
	}
	if ix.seen == nil {
		ix.seen = make([]int32, len(ix.segs))
	}
	ix.stamp++
	if ix.stamp == math.MaxInt32 {
		clear(ix.seen)
		ix.stamp = 1
	}
	i0, i1, j0, j1 := ix.cellRange(b)
	for j := j0; j <= j1; j++ {
		for i := i0; i <= i1; i++ {
			c := j*ix.nx + i
			for _, it := range ix.items[ix.start[c]:ix.start[c+1]] {
				if ix.seen[it.seg] == ix.stamp {
					continue
				}
				ix.seen[it.seg] = ix.stamp
				if overlap(it.box, b) {
					fn(int(it.seg))
				}
			}
		}
	}
}

// PathCrossing is a crossing of a polyline with an indexed segment.
type PathCrossing struct {
	// Segment is the index of the crossed segment.
	Segment int
	// Distance along the polyline from its first point, m.
	Distance float64
	// Point of the crossing, m.
	Point r2.Vec
}

// CrossPolyline returns the crossings of the polyline path with the
// indexed segments, sorted by distance along the path, then segment. A
// segment met at a shared vertex of two path legs is reported once.
func (ix *Index) CrossPolyline(path []r2.Vec) []PathCrossing {
	var out []PathCrossing
	var along float64
	for k := 0; k+1 < len(path); k++ {
		leg := Segment{P0: path[k], P1: path[k+1]}
		legLen := r2.Norm(r2.Sub(leg.P1, leg.P0))
		ix.query(boxOf(leg), func(s int) {
			if x, ok := IntersectSegments(leg, ix.segs[s]); ok {
				out = append(out, PathCrossing{Segment: s, Distance: along + x.S*legLen, Point: x.Point})
			}
		})
		along += legLen
	}
	// Drop repeats of one segment at (nearly) the same distance: a
	// crossing at a path vertex is found by both legs.
	slices.SortFunc(out, func(p, q PathCrossing) int {
		if p.Segment != q.Segment {
			return p.Segment - q.Segment
		}
		return cmpFloat(p.Distance, q.Distance)
	})
	out = slices.CompactFunc(out, func(p, q PathCrossing) bool {
		return p.Segment == q.Segment && math.Abs(p.Distance-q.Distance) <= GeomTol
	})
	slices.SortFunc(out, func(p, q PathCrossing) int {
		if c := cmpFloat(p.Distance, q.Distance); c != 0 {
			return c
		}
		return p.Segment - q.Segment
	})
	return out
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
