package report

import (
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// chartFrame is where a chart's data area ended up on its page, so that
// tests can find the pixel of a data point.
type chartFrame struct {
	pg   *page
	p    *plot.Plot
	data draw.Canvas // Data area, page points.
}

// newChartFrame records the data area of p drawn in area.
func newChartFrame(pg *page, p *plot.Plot, area draw.Canvas) chartFrame {
	return chartFrame{pg: pg, p: p, data: p.DataCanvas(area)}
}

// pixel returns the image coordinates of data point (x, y), in the
// plot's units and scales.
func (f chartFrame) pixel(x, y float64) (px, py float64) {
	tx, ty := f.p.Transforms(&f.data)
	return f.pg.pixel(vg.Point{X: tx(x), Y: ty(y)})
}
