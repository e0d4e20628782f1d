package elastic

import "gonum.org/v1/gonum/spatial/r2"

// Probe evaluates the stress change at any map point by direct summation
// over the elements: exact and O(N) per point, with nothing stored but the
// elements, for a few points that are not known in advance (Field is the
// faster choice for many fixed points). The height correction is Field's.
type Probe struct {
	m *model
}

// NewProbe returns the probe of the stress change caused by the elements.
// It returns the errors of NewDense.
func NewProbe(elems []Element, m Material, s Settings) (*Probe, error) {
	r, err := prepare(elems, m, s)
	if err != nil {
		return nil, err
	}
	return &Probe{m: newModel(elems, m, r)}, nil
}

// StressAt returns the stress change at point p caused by slip and opening
// (one per element, m). Stress at an element's tip is singular; a point
// there gets non-finite values.
func (pr *Probe) StressAt(p r2.Vec, slip, opening []float64) Stress {
	return pr.m.stressAt(p, slip, opening)
}

// stressAt sums the stress change at p over the elements with slip or
// opening.
func (md *model) stressAt(p r2.Vec, slip, opening []float64) Stress {
	checkLen(len(md.geo), slip, opening)
	var out Stress
	for j := range md.geo {
		if slip[j] == 0 && opening[j] == 0 {
			continue
		}
		s := md.field(p, j)
		out.XX += s[0].XX*slip[j] + s[1].XX*opening[j]
		out.YY += s[0].YY*slip[j] + s[1].YY*opening[j]
		out.XY += s[0].XY*slip[j] + s[1].XY*opening[j]
	}
	return out
}
