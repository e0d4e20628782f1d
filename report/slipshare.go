package report

import (
	"fmt"
	"io"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg/draw"
)

// SlipShares is the chart of the share of fractures that slip against the
// pore-pressure increase, one line per set (and one for all fractures),
// with a lower panel of the share of trace length on the same pressure
// axis. A fracture counts as slipping at Δp once its critical increase
// Δp_c ≤ Δp; the shares come from the screening, not from this package.
type SlipShares struct {
	Title string
	Note  string // Printed under the chart, e.g. the stress path assumed.
	// Series are drawn in order, each with its own colour, dash and
	// marker.
	// Series with more than 40 points are drawn without markers.
	Series []ShareSeries
}

// ShareSeries is one line of a SlipShares chart.
type ShareSeries struct {
	Name string // e.g. the set name, or "All fractures".
	// Increase is the pore-pressure increase Δp of each point, Pa,
	// non-decreasing.
	Increase []float64
	// Fractures is the share of the fractures slipping at each Δp, 0–1.
	Fractures []float64
	// TraceLength is the share of trace length slipping at each Δp, 0–1;
	// nil leaves the series out of the lower panel.
	TraceLength []float64
}

// WritePNG draws the chart at size s (zero: DefaultSize) and writes it to
// w as PNG. Invalid input returns an error and writes nothing.
func (c *SlipShares) WritePNG(w io.Writer, s Size) error {
	pg, err := c.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks every series.
func (c *SlipShares) validate() error {
	if len(c.Series) == 0 {
		return fmt.Errorf("report: slip-share chart has no series")
	}
	for i, se := range c.Series {
		chart := fmt.Sprintf("slip-share Series[%d] (%q)", i, se.Name)
		if len(se.Increase) == 0 {
			return fmt.Errorf("report: %s has no pressure increases", chart)
		}
		for k, v := range se.Increase {
			if !finite(v) || v < 0 || (k > 0 && v < se.Increase[k-1]) {
				return fmt.Errorf("report: %s Increase[%d] = %g Pa: need finite, ≥ 0 and non-decreasing increases", chart, k, v)
			}
		}
		if err := checkShares(chart, "Fractures", se.Fractures, len(se.Increase)); err != nil {
			return err
		}
		if se.TraceLength != nil {
			if err := checkShares(chart, "TraceLength", se.TraceLength, len(se.Increase)); err != nil {
				return err
			}
		}
	}
	return nil
}

// checkShares requires n shares in [0, 1].
func checkShares(chart, name string, v []float64, n int) error {
	if len(v) != n {
		return fmt.Errorf("report: %s %s has %d values for %d increases: need one per increase", chart, name, len(v), n)
	}
	for i, x := range v {
		if !(x >= 0 && x <= 1) {
			return fmt.Errorf("report: %s %s[%d] = %g: a share must be in [0, 1]", chart, name, i, x)
		}
	}
	return nil
}

// render draws the chart on a new page.
func (c *SlipShares) render(s Size) (*page, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, err
	}
	if err := c.validate(); err != nil {
		return nil, err
	}
	pg := newPage(s)
	body := frame(pg.dc, c.Title, c.Note)
	top := newPlot("Pore-pressure increase Δp, MPa", "Share of fractures slipping, %")
	low := newPlot("Pore-pressure increase Δp, MPa", "Share of trace length slipping, %")
	hi := 0.0
	var rows []keyRow
	hasLength := false
	for i, se := range c.Series {
		st := styleOf(i)
		marked := addLinePoints(top, sharePoints(se.Increase, se.Fractures), st)
		if se.TraceLength != nil {
			addLinePoints(low, sharePoints(se.Increase, se.TraceLength), st)
			hasLength = true
		}
		hi = max(hi, se.Increase[len(se.Increase)-1]*1e-6)
		rows = append(rows, st.keyRow(se.Name, marked))
	}
	if hi == 0 {
		hi = 1
	}
	plots := []*plot.Plot{top}
	if hasLength {
		plots = append(plots, low)
	}
	for _, p := range plots {
		p.Add(horizontalGrid())
		p.X.Min, p.X.Max, p.X.Padding = 0, hi, 0
		p.Y.Min, p.Y.Max, p.Y.Padding = 0, 100, 0
	}
	body = keyBelow(body, rows)
	if !hasLength {
		top.Draw(body)
		return pg, nil
	}
	top.X.Label.Text = ""
	top.X.Tick.Marker = unlabelled{top.X.Tick.Marker}
	const gap = 10 // Between the panels, points.
	split := body.Min.Y + 0.48*(body.Max.Y-body.Min.Y)
	upper, lower := body, body
	upper.Min.Y = split + gap
	lower.Max.Y = split
	alignX(plots, []*draw.Canvas{&upper, &lower})
	top.Draw(upper)
	low.Draw(lower)
	return pg, nil
}

// sharePoints returns (Δp in MPa, share in %) points.
func sharePoints(dp, share []float64) plotter.XYs {
	pts := make(plotter.XYs, len(dp))
	for i := range dp {
		pts[i] = plotter.XY{X: dp[i] * 1e-6, Y: 100 * share[i]}
	}
	return pts
}
