package pipeline

import (
	"fmt"
	"math"
	"strings"
	"time"

	"github.com/paulmach/orb"

	"slipfront/dfn"
	"slipfront/gis"
	"slipfront/internal/caution"
	"slipfront/scenarios"
	"slipfront/sim"
)

// Run is the state of a run at one time, with what maps are drawn from.
type Run struct {
	Scenario *scenarios.Scenario
	Network  *dfn.Network
	// Result holds the elements, their state at Time and the events up to
	// it; Timeline and Stages may be empty (a run read back from a folder).
	Result *sim.Result
	// Time of the state, s.
	Time float64
	// OutlineTimes are the times of the stimulated-area outlines.
	OutlineTimes []float64
	// Complete tells that the run was read from a complete folder (all its
	// files checked against its contents list); Notes say what a reader had
	// to assume otherwise (a stopped run, recovered or damaged frames).
	Complete bool
	Notes    []string
}

// Placement returns where the run's local coordinates lie on the map.
func (r *Run) Placement() (gis.Placement, error) { return mapPlacement(r.Scenario) }

// mapPlacement returns where the scenario's local coordinates lie on the map.
func mapPlacement(s *scenarios.Scenario) (gis.Placement, error) {
	crs, err := gis.ParseCRS(s.Domain.CRSSpec())
	if err != nil {
		return gis.Placement{}, err
	}
	return gis.Placement{CRS: crs, Easting: s.Domain.OriginEasting, Northing: s.Domain.OriginNorthing}, nil
}

// Grid returns the scenario's map grid as a gis raster grid.
func (r *Run) Grid() gis.Grid {
	g := r.Scenario.MapGrid()
	return gis.Grid{Cols: g.Cols, Rows: g.Rows, CellSize: g.CellSize, XMin: g.XMin, YMin: g.YMin}
}

// LayerNames are the layers Layers builds, in order; after production
// ([depletion]) StressLayerName follows.
var LayerNames = []string{"fractures", "conduits", "stimulated_area", "events", "wells", "clusters"}

// Layers builds every vector layer of the run.
func (r *Run) Layers() ([]gis.Layer, error) {
	outlines, err := r.outlineLayer()
	if err != nil {
		return nil, err
	}
	fractures, err := r.fractureLayer()
	if err != nil {
		return nil, err
	}
	layers := []gis.Layer{fractures, r.conduitLayer(), outlines, r.eventLayer(), wellLayer(r.Scenario), r.clusterLayer()}
	d, err := r.Depletion()
	if err != nil {
		return nil, err
	}
	if d != nil {
		stress, err := stressLayer(r.Scenario, d)
		if err != nil {
			return nil, err
		}
		layers = append(layers, stress)
	}
	return withCaution(layers), nil
}

// withCaution adds the caution to every layer's description, so it travels
// with the map into a GIS.
func withCaution(layers []gis.Layer) []gis.Layer {
	for i := range layers {
		layers[i].Description += " — " + caution.Short
	}
	return layers
}

// Layer builds the named layer.
func (r *Run) Layer(name string) (gis.Layer, error) {
	layers, err := r.Layers()
	if err != nil {
		return gis.Layer{}, err
	}
	for _, l := range layers {
		if l.Name == name {
			return l, nil
		}
	}
	return gis.Layer{}, fmt.Errorf("no layer %q in a run; layers: %s (and %s after production)", name, strings.Join(LayerNames, ", "), StressLayerName)
}

func line(a, b orb.Point) orb.LineString { return orb.LineString{a, b} }

func pt(x, y float64) orb.Point { return orb.Point{x, y} }

// nullable returns nil for NaN (a NULL attribute).
func nullable(v float64) any {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return v
}

// stageName is stage k's name, or nil (NULL) for none.
func (r *Run) stageName(k int) any {
	if name := scenarios.StageNameAt(r.Scenario.PumpingOrder(), k); name != "" {
		return name
	}
	return nil
}

func (r *Run) fractureLayer() (gis.Layer, error) {
	l := gis.Layer{Name: "fractures", Description: "natural fracture traces on the layer mid-plane with their final state",
		Geometry: gis.LineString, Fields: []gis.Field{
			{Name: "fracture_id", Type: gis.Int32}, {Name: "set_name", Type: gis.Text}, {Name: "network_cluster", Type: gis.Int32},
			{Name: "dip_deg", Type: gis.Real}, {Name: "dip_direction_deg", Type: gis.Real}, {Name: "trace_length_m", Type: gis.Real},
			{Name: "max_slip_mm", Type: gis.Real}, {Name: "mean_aperture_mm", Type: gis.Real},
			{Name: "permeability_gain", Type: gis.Real}, {Name: "retained_permeability_gain", Type: gis.Real},
			{Name: "first_slip_time_s", Type: gis.Real},
			{Name: "first_slip_stage", Type: gis.Text}, {Name: "stimulated", Type: gis.Boolean},
		}}
	byFracture, err := r.fracturesByID(r.Result)
	if err != nil {
		return l, err
	}
	for _, t := range r.Network.Traces {
		f, ok := byFracture[t.Fracture]
		if !ok {
			continue
		}
		l.Features = append(l.Features, gis.Feature{
			Geometry: line(pt(t.P0.X, t.P0.Y), pt(t.P1.X, t.P1.Y)),
			Values: []any{t.Fracture, f.SetName, t.Cluster, f.Dip * 180 / math.Pi, f.DipDirection * 180 / math.Pi, t.Length,
				f.MaxSlip * 1e3, f.MeanAperture * 1e3,
				nullable(f.PermeabilityGain), nullable(f.RetainedPermeabilityGain), nullable(f.FirstSlip),
				r.stageName(f.FirstSlipStage), f.StimulatedLength > 0},
		})
	}
	return l, nil
}

// fracturesByID returns sim.Fractures of res by fracture index.
func (r *Run) fracturesByID(res *sim.Result) (map[int]sim.FractureResult, error) {
	fractures, err := sim.Fractures(r.Scenario, r.Network, res)
	if err != nil {
		return nil, err
	}
	byID := make(map[int]sim.FractureResult, len(fractures))
	for _, f := range fractures {
		byID[f.Fracture] = f
	}
	return byID, nil
}

func (r *Run) conduitLayer() gis.Layer {
	l := gis.Layer{Name: "conduits", Description: "primary conduits from the perforation clusters (elements; of growing fractures, the opened part)",
		Geometry: gis.LineString, Fields: []gis.Field{{Name: "element_id", Type: gis.Int32}, {Name: "aperture_mm", Type: gis.Real}}}
	for i, el := range r.Result.Elements {
		if el.Set != sim.ConduitSet || !r.Result.IsOpen(i) {
			continue
		}
		l.Features = append(l.Features, gis.Feature{Geometry: line(pt(el.P0.X, el.P0.Y), pt(el.P1.X, el.P1.Y)),
			Values: []any{i, r.Result.Aperture[i] * 1e3}})
	}
	return l
}

// outlineLayer outlines the stimulated area at every outline time: the
// region within numerics.stimulated_reach of the elements stimulated by
// then, whose exact area the feature carries.
func (r *Run) outlineLayer() (gis.Layer, error) {
	l := gis.Layer{Name: "stimulated_area", Description: "stimulated area at each snapshot time: the region within numerics.stimulated_reach of the stimulated fracture elements",
		Geometry: gis.MultiPolygon, Fields: []gis.Field{{Name: "time_s", Type: gis.Real}, {Name: "utc_time", Type: gis.DateTime},
			{Name: "stimulated_area_m2", Type: gis.Real}}}
	res := r.Result
	reach := r.Scenario.Numerics.StimulatedReach
	start := scheduleStart(r.Scenario.Schedule.Start)
	for _, t := range r.OutlineTimes {
		stimulated := func(i int) bool { return res.StimulatedAt[i] <= t }
		mp, err := sim.StimulatedOutline(res.Elements, stimulated, reach, 0)
		if err != nil {
			return l, err
		}
		if len(mp) == 0 {
			continue
		}
		l.Features = append(l.Features, gis.Feature{Geometry: mp, Values: []any{t, utc(start, t), sim.StimulatedArea(res.Elements, stimulated, reach)}})
	}
	return l, nil
}

func (r *Run) eventLayer() gis.Layer {
	l := gis.Layer{Name: "events", Description: "synthetic microseismic events (one per rupture)",
		Geometry: gis.Point, Fields: []gis.Field{
			{Name: "time_s", Type: gis.Real}, {Name: "utc_time", Type: gis.DateTime}, {Name: "stage", Type: gis.Text},
			{Name: "fracture_id", Type: gis.Int32}, {Name: "depth_m", Type: gis.Real}, {Name: "slip_mm", Type: gis.Real},
			{Name: "rupture_area_m2", Type: gis.Real}, {Name: "moment_Nm", Type: gis.Real}, {Name: "magnitude_Mw", Type: gis.Real},
		}}
	start := scheduleStart(r.Scenario.Schedule.Start)
	for _, e := range r.Result.Events {
		if !r.shows(e.Time) {
			continue
		}
		l.Features = append(l.Features, gis.Feature{Geometry: pt(e.X, e.Y), Values: []any{
			e.Time, utc(start, e.Time), r.stageName(e.Stage), e.Fracture, e.Depth, e.Slip * 1e3, e.Area, e.Moment, e.Magnitude}})
	}
	return l
}

// utc returns the UTC date and time t s after start.
func utc(start time.Time, t float64) time.Time {
	return start.Add(time.Duration(t * float64(time.Second))).UTC()
}

// wellLayer is the wells of s in map view.
func wellLayer(s *scenarios.Scenario) gis.Layer {
	l := gis.Layer{Name: "wells", Description: "well paths in map view", Geometry: gis.LineString,
		Fields: []gis.Field{{Name: "well", Type: gis.Text}, {Name: "path_length_m", Type: gis.Real}}}
	for _, w := range s.Wells {
		var ls orb.LineString
		for _, p := range w.Path {
			ls = append(ls, pt(p.X, p.Y))
		}
		l.Features = append(l.Features, gis.Feature{Geometry: ls, Values: []any{w.Name, w.PathLength()}})
	}
	return l
}

func (r *Run) clusterLayer() gis.Layer {
	l := gis.Layer{Name: "clusters", Description: "perforation clusters", Geometry: gis.Point,
		Fields: []gis.Field{{Name: "well", Type: gis.Text}, {Name: "stage", Type: gis.Text}, {Name: "perforation_cluster", Type: gis.Int32},
			{Name: "distance_along_path_m", Type: gis.Real}, {Name: "pumping_order", Type: gis.Int32}}}
	for k, ps := range r.Scenario.PumpingOrder() {
		w := r.Scenario.Wells[ps.Well]
		path := r.Network.Wells[ps.Well].Path
		for c, d := range w.Stages[ps.Stage].Clusters {
			p := sim.PointAlong(path, d)
			l.Features = append(l.Features, gis.Feature{Geometry: pt(p.X, p.Y), Values: []any{w.Name, ps.Name, c, d, k + 1}})
		}
	}
	return l
}
