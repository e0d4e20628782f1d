package footprint

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
)

// fuzzSegments decodes a network from data: byte 0 sets r (0.25–16 m),
// byte 1 an offset 10^k m added to every coordinate (k = 0…11: up to map
// and beyond-map coordinates), then 5 bytes per segment: a mode and four
// signed coordinates (m). Modes make the degenerate cases: a point, a
// segment collinear with the previous one (overlapping or not), one that
// starts where the previous ended, a copy of the previous one reversed,
// and one whose end touches the previous one's interior.
func fuzzSegments(data []byte) ([]dfn.Segment, float64) {
	if len(data) < 2 {
		return nil, 1
	}
	r := 0.25 * math.Pow(2, float64(data[0]%7))
	off := math.Pow(10, float64(data[1]%12))
	var segs []dfn.Segment
	for b := data[2:]; len(b) >= 5 && len(segs) < 40; b = b[5:] {
		v := func(i int) float64 { return float64(int8(b[i])) }
		p, q := r2.Vec{X: v(1), Y: v(2)}, r2.Vec{X: v(3), Y: v(4)}
		if n := len(segs); n > 0 {
			last := segs[n-1]
			d := r2.Sub(last.P1, last.P0)
			switch b[0] % 6 {
			case 1:
				q = p
			case 2:
				p, q = r2.Add(last.P0, r2.Scale(v(1)/32, d)), r2.Add(last.P0, r2.Scale(v(2)/32, d))
			case 3:
				p = last.P1
			case 4:
				p, q = last.P1, last.P0
			case 5:
				q = r2.Add(last.P0, r2.Scale(float64(b[4])/255, d))
			}
		}
		segs = append(segs, dfn.Segment{P0: p, P1: q})
	}
	for i := range segs {
		segs[i].P0 = r2.Add(segs[i].P0, r2.Vec{X: off, Y: off})
		segs[i].P1 = r2.Add(segs[i].P1, r2.Vec{X: off, Y: off})
	}
	return segs, r
}

// FuzzFootprint checks, on any input, that Area, Outline and EnvelopeArea do
// not panic, that the area lies between the largest stadium's and the sum
// of all (the union contains each and is covered by all; Steiner formula,
// see steiner), that the outline is well formed and inscribed
// (checkOutline), and that the envelope is no smaller than the union.
// Inputs too fine for their coordinates must be refused by all alike.
func FuzzFootprint(f *testing.F) {
	f.Add([]byte{3, 0, 0, 0, 0, 10, 0})
	f.Add([]byte{2, 0, 0, 0, 0, 20, 0, 2, 16, 48, 0, 0, 3, 0, 0, 0, 20, 4, 0, 0, 0, 0})
	f.Add([]byte{1, 11, 0, 1, 1, 5, 5, 1, 3, 3, 0, 0, 5, 0, 0, 0, 100, 0, 0, 0})
	f.Add([]byte{6, 6, 0, 100, 100, 156, 156, 5, 0, 0, 0, 128, 4, 0, 0, 0, 0, 0, 127, 127, 128, 128})
	f.Fuzz(func(t *testing.T, data []byte) {
		segs, r := fuzzSegments(data)
		a, err := Area(segs, r)
		mp, oerr := Outline(segs, r, OutlineOptions{Sagitta: 0.01 * r})
		if (err == nil) != (oerr == nil) {
			t.Fatalf("Area error %v, Outline error %v", err, oerr)
		}
		if err != nil {
			return
		}
		lo, hi := 0.0, 0.0
		for _, s := range segs {
			st := steiner(s, r)
			lo, hi = max(lo, st), hi+st
		}
		// The sum bound loses the relative rounding of the terms, and the
		// merge of collinear runs may move a boundary by its tolerance
		// (64ε of the coordinates) along the run: slack of both sizes. The
		// sweep's area of a few segments was found 1.7e-12 (relative)
		// below the largest single term: 1e-10 leaves room for that
		// rounding and none for a real error.
		slack := 1e-10*hi + 2*64*epsilon*extent(segs)*2*r*float64(len(segs))
		if !(a >= lo-slack && a <= hi+slack) {
			t.Fatalf("area %.15g outside [%.15g, %.15g] for %d segments, r = %g", a, lo, hi, len(segs), r)
		}
		if len(segs) > 0 {
			checkOutline(t, "fuzz", segs, mp, r, 0.01*r)
		}
		// The envelope holds the union (the two areas are different sums of
		// the same terms: a fuzz input found them 1.7e-12 apart, relative).
		e, _, err := EnvelopeArea(segs, r)
		if err != nil {
			t.Fatalf("EnvelopeArea: %v after Area succeeded", err)
		}
		if e < a-slack {
			t.Fatalf("envelope %.15g below the area %.15g", e, a)
		}
	})
}
