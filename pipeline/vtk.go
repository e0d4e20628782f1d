package pipeline

import (
	"errors"
	"io"
	"math"
	"path/filepath"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/gis"
	"slipfront/sim"
	"slipfront/snapshot"
)

// Fields of the VTK files: per fracture polygon (cell data) and per event
// point (point data). NaN is a missing value (never slipped; no gain).
var (
	VTKFractureFields = []string{"fracture_id", "set", "max_slip_mm", "first_slip_time_s", "critical_dp_MPa", "permeability_gain", "retained_permeability_gain"}
	VTKEventFields    = []string{"time_s", "magnitude_Mw", "moment_Nm", "slip_mm", "stage", "fracture_id"}
)

// exportVTK writes the VTK folder o.Out from the run folder dir (see
// Folder: written whole, replaced only with Force): VTKCollectionFile, a
// ParaView collection of every snapshot time (or only the state at
// o.Time), and per time k vtkFracturesFile(k), the fractures crossing the
// layer as 3-D polygons (gis.WriteVTKPolygons) with VTKFractureFields,
// and vtkEventsFile(k), the events up to that time as points with
// VTKEventFields. Coordinates are the scenario's CRS, origin applied,
// z the elevation, all in the CRS's unit (gis.WriteVTKPolygons).
func exportVTK(dir string, o ExportOptions) ([]string, error) {
	r, err := LoadRun(dir, o.Time)
	if err != nil {
		return nil, err
	}
	pl, err := r.Placement()
	if err != nil {
		return nil, err
	}
	times := r.OutlineTimes // Every intact frame up to the run's time.
	if !math.IsNaN(o.Time) {
		times = []float64{r.Time}
	}
	fractures, err := r.vtkPolygons()
	if err != nil {
		return nil, err
	}
	out := Folder{Dir: o.Out, Force: o.Force}
	st, err := out.begin()
	if err != nil {
		return nil, err
	}
	if err := r.writeVTKSeries(filepath.Join(dir, SnapshotFile), st.Dir, pl, fractures, times); err != nil {
		return nil, errors.Join(err, st.Abandon())
	}
	return r.Notes, st.Commit()
}

// writeVTKSeries writes the files of every time into dir: the state of
// each is replayed from the snapshot.
func (r *Run) writeVTKSeries(snap, dir string, pl gis.Placement, fractures vtkFractures, times []float64) error {
	rd, err := snapshot.Open(snap)
	if err != nil {
		return err
	}
	defer rd.Close()
	var entries []gis.PVDEntry
	for k, t := range times {
		res, _, err := sim.Replay(rd.Reader, t)
		if err != nil {
			return err
		}
		polys, err := fractures.at(r, res)
		if err != nil {
			return err
		}
		pts := r.vtkEvents(t)
		fname, ename := vtkFracturesFile(k), vtkEventsFile(k)
		if err := writeFiles(dir,
			namedWriter{fname, func(w io.Writer) error { return gis.WriteVTKPolygons(w, pl, polys) }},
			namedWriter{ename, func(w io.Writer) error { return gis.WriteVTKPoints(w, pl, pts) }},
		); err != nil {
			return err
		}
		entries = append(entries, gis.PVDEntry{Time: t, Part: 0, File: fname}, gis.PVDEntry{Time: t, Part: 1, File: ename})
	}
	return writeFiles(dir, namedWriter{VTKCollectionFile, func(w io.Writer) error { return gis.WritePVD(w, entries) }})
}

// vtkFractures are the fractures crossing the layer, in fracture order:
// their outlines and the fields that do not change with time.
type vtkFractures struct {
	ids      []int
	rings    [][]r3.Vec
	set, dpc []float64
}

// vtkPolygons returns the fractures crossing the layer with their set and
// critical pressure increase Δp_c, MPa, under the initial stress.
func (r *Run) vtkPolygons() (vtkFractures, error) {
	stress, crit, err := screenCriteria(r.Scenario)
	if err != nil {
		return vtkFractures{}, err
	}
	var v vtkFractures
	seen := map[int]bool{}
	for _, t := range r.Network.Traces {
		if seen[t.Fracture] {
			continue
		}
		seen[t.Fracture] = true
		f := &r.Network.Fractures[t.Fracture]
		ps := stress.Resolve(f.Normal)
		v.ids = append(v.ids, t.Fracture)
		v.rings = append(v.rings, fractureRing(f))
		v.set = append(v.set, float64(f.Set))
		v.dpc = append(v.dpc, crit.CriticalIncrease(ps.SigmaN, ps.Tau, stress.PorePressure())/1e6)
	}
	return v, nil
}

// at returns the polygons with the state of res: largest slip, mm, first
// slip time, s, and permeability gain (sim.Fractures); NaN for fractures
// without elements.
func (v vtkFractures) at(r *Run, res *sim.Result) (gis.VTKPolygons, error) {
	n := len(v.ids)
	slip, first, gain, retained := nans(n), nans(n), nans(n), nans(n)
	byFracture, err := r.fracturesByID(res)
	if err != nil {
		return gis.VTKPolygons{}, err
	}
	ids := make([]float64, n)
	for i, id := range v.ids {
		ids[i] = float64(id)
		if f, ok := byFracture[id]; ok {
			slip[i], first[i], gain[i] = f.MaxSlip*1e3, f.FirstSlip, finiteOrNaN(f.PermeabilityGain)
			retained[i] = finiteOrNaN(f.RetainedPermeabilityGain)
		}
	}
	values := [][]float64{ids, v.set, slip, first, v.dpc, gain, retained}
	p := gis.VTKPolygons{Rings: v.rings}
	for k, name := range VTKFractureFields {
		p.Fields = append(p.Fields, gis.VTKField{Name: name, Values: values[k]})
	}
	return p, nil
}

// vtkEvents are the run's events up to time t, s.
func (r *Run) vtkEvents(t float64) gis.VTKPoints {
	var p gis.VTKPoints
	values := make([][]float64, len(VTKEventFields))
	for _, e := range r.Result.Events {
		if e.Time > t+eventTimeSlack {
			continue
		}
		p.Points = append(p.Points, r3.Vec{X: e.X, Y: e.Y, Z: -e.Depth})
		for k, v := range []float64{e.Time, e.Magnitude, e.Moment, e.Slip * 1e3, float64(e.Stage), float64(e.Fracture)} {
			values[k] = append(values[k], v)
		}
	}
	for k, name := range VTKEventFields {
		p.Fields = append(p.Fields, gis.VTKField{Name: name, Values: values[k]})
	}
	return p
}

func nans(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = math.NaN()
	}
	return v
}

// finiteOrNaN maps an infinite value (a gain over a zero initial aperture)
// to NaN, which VTK keeps as missing.
func finiteOrNaN(v float64) float64 {
	if math.IsInf(v, 0) {
		return math.NaN()
	}
	return v
}
