package pipeline

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"

	"slipfront/gis"
	"slipfront/report"
	"slipfront/sim"
)

// MapPicture is the quick-look map of the run: traces coloured by
// first-slip time, wells, clusters, events sized by magnitude and the final
// stimulated-area outline.
func (r *Run) MapPicture() (*report.Map, error) {
	s := r.Scenario
	m := &report.Map{
		Title:  fmt.Sprintf("%s — realization %d, t = %.2f h", s.Name, r.Network.Realization, r.Time/3600),
		Extent: report.Extent{MinEast: s.Domain.XMin, MaxEast: s.Domain.XMax, MinNorth: s.Domain.YMin, MaxNorth: s.Domain.YMax},
		Colour: report.ColourScale{Label: "First slip time", Unit: "h", NoValue: "Never slipped"},
	}
	if pl, err := r.Placement(); err == nil && pl.CRS.Defined() {
		o, u := pl.ToCRS(orb.Point{0, 0}), pl.CRS.Unit().Abbrev()
		name := pl.CRS.Name()
		if pl.CRS.EPSG != 0 {
			name += fmt.Sprintf(" (EPSG:%d)", pl.CRS.EPSG)
		}
		m.CRSNote = fmt.Sprintf("Local frame: origin at E %.0f %s, N %.0f %s of %s", o[0], u, o[1], u, name)
	}
	res := r.Result
	for i, el := range res.Elements {
		v := res.FirstSlip[i] / 3600
		if el.Set == sim.ConduitSet { // conduits: drawn, without a value
			v = math.NaN()
		}
		m.Traces = append(m.Traces, report.Trace{A: rp(el.P0.X, el.P0.Y), B: rp(el.P1.X, el.P1.Y), Value: v})
	}
	for _, l := range []gis.Layer{r.wellLayer(), r.clusterLayer()} {
		for _, f := range l.Features {
			switch g := f.Geometry.(type) {
			case orb.LineString:
				w := report.Well{Name: f.Values[0].(string)}
				for _, p := range g {
					w.Path = append(w.Path, rp(p[0], p[1]))
				}
				m.Wells = append(m.Wells, w)
			case orb.Point:
				m.Clusters = append(m.Clusters, report.Cluster{At: rp(g[0], g[1]), Stage: f.Values[1].(string)})
			}
		}
	}
	for _, e := range res.Events {
		if r.shows(e.Time) {
			m.Events = append(m.Events, report.Event{At: rp(e.X, e.Y), Magnitude: e.Magnitude})
		}
	}
	outlines, err := r.outlineLayer()
	if err != nil {
		return nil, err
	}
	if n := len(outlines.Features); n > 0 {
		for _, poly := range outlines.Features[n-1].Geometry.(orb.MultiPolygon) {
			var p report.Polygon
			for _, ring := range poly {
				var pr []report.Point
				for _, q := range ring {
					pr = append(pr, rp(q[0], q[1]))
				}
				p = append(p, pr)
			}
			m.Outline = append(m.Outline, p)
		}
	}
	return m, nil
}

func rp(x, y float64) report.Point { return report.Point{East: x, North: y} }

// GrowthPicture is the stimulated area over time with the stage starts
// and the bottom-hole pressure.
func (r *Run) GrowthPicture() *report.Growth {
	g := &report.Growth{Title: fmt.Sprintf("%s — stimulated area, realization %d", r.Scenario.Name, r.Network.Realization)}
	for _, x := range r.Result.Timeline {
		g.Time = append(g.Time, x.Time)
		g.Area = append(g.Area, x.StimulatedArea)
		g.Pressure = append(g.Pressure, x.BHP)
	}
	for _, st := range r.Result.Stages {
		g.Stages = append(g.Stages, report.StageMark{Name: st.Name, Start: st.Start})
	}
	return g
}
