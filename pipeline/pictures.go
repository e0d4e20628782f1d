package pipeline

import (
	"fmt"

	"github.com/paulmach/orb"

	"slipfront/gis"
	"slipfront/report"
	"slipfront/scenarios"
	"slipfront/sim"
)

// MapPicture is the quick-look map of the run: traces coloured by
// first-slip time, primary conduits, wells, clusters, events sized by
// magnitude, the final stimulated-area outline, the SHmax direction and,
// after production ([depletion]), the local SHmax as ticks.
func (r *Run) MapPicture() (*report.Map, error) {
	s := r.Scenario
	m := baseMap(s, fmt.Sprintf("%s — realization %d, t = %.2f h", s.Name, r.Network.Realization, r.Time/3600))
	m.Colour = report.ColourScale{Label: "First slip time", Unit: "h", NoValue: "Never slipped"}
	res := r.Result
	for i, el := range res.Elements {
		a, b := rp(el.P0.X, el.P0.Y), rp(el.P1.X, el.P1.Y)
		if el.Set == sim.ConduitSet {
			if res.IsOpen(i) {
				m.Conduits = append(m.Conduits, report.Segment{A: a, B: b})
			}
			continue
		}
		m.Traces = append(m.Traces, report.Trace{A: a, B: b, Value: res.FirstSlip[i] / 3600})
	}
	m.Wells = mapWells(s)
	d, err := r.Depletion()
	if err != nil {
		return nil, err
	}
	if m.StressTicks, err = stressTicks(s, d); err != nil {
		return nil, err
	}
	for _, f := range r.clusterLayer().Features {
		g := f.Geometry.(orb.Point)
		m.Clusters = append(m.Clusters, report.Cluster{At: rp(g[0], g[1]), Stage: f.Values[1].(string)})
	}
	for _, e := range res.Events {
		if r.shows(e.Time) {
			m.Events = append(m.Events, report.Event{At: rp(e.X, e.Y), Magnitude: e.Magnitude})
		}
	}
	for _, e := range res.RateEvents {
		if r.shows(e.Time) {
			m.SmallEvents = append(m.SmallEvents, rp(e.X, e.Y))
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

// baseMap is a map of the scenario's domain with its CRS note and the
// SHmax direction.
func baseMap(s *scenarios.Scenario, title string) *report.Map {
	az := s.Stress.SHmaxAzimuth
	return &report.Map{
		Title:   title,
		Extent:  domainExtent(s),
		CRSNote: crsNote(s),
		SHmax:   &az,
	}
}

// domainExtent is the scenario's map area.
func domainExtent(s *scenarios.Scenario) report.Extent {
	d := s.Domain
	return report.Extent{MinEast: d.XMin, MaxEast: d.XMax, MinNorth: d.YMin, MaxNorth: d.YMax}
}

// crsNote says where the local frame lies, or "" for an undefined frame.
func crsNote(s *scenarios.Scenario) string {
	crs, err := gis.ParseCRS(s.Domain.CRSSpec())
	if err != nil || !crs.Defined() {
		return ""
	}
	pl := gis.Placement{CRS: crs, Easting: s.Domain.OriginEasting, Northing: s.Domain.OriginNorthing}
	o, u := pl.ToCRS(orb.Point{0, 0}), crs.Unit().Abbrev()
	name := crs.Name()
	if crs.EPSG != 0 {
		name += fmt.Sprintf(" (EPSG:%d)", crs.EPSG)
	}
	return fmt.Sprintf("Local frame: origin at E %.0f %s, N %.0f %s of %s", o[0], u, o[1], u, name)
}

// mapWells are the scenario's well paths in map view.
func mapWells(s *scenarios.Scenario) []report.Well {
	var ws []report.Well
	for _, w := range s.Wells {
		rw := report.Well{Name: w.Name}
		for _, p := range w.Path {
			rw.Path = append(rw.Path, rp(p.X, p.Y))
		}
		ws = append(ws, rw)
	}
	return ws
}

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
