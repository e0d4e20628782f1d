package pipeline

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"slipfront/batch"
	"slipfront/gis"
	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
)

// Formats accepted by Export (in any letter case). "vtk" writes a folder
// (see exportVTK); the others one file.
var Formats = []string{"gpkg", "geojson", "geotiff", "quakeml", "vtk"}

// StdoutName as ExportOptions.Out writes a single-file format to
// ExportOptions.Stdout.
const StdoutName = "-"

// ExportOptions select what Export writes.
type ExportOptions struct {
	// Format is one of Formats, in any letter case.
	Format string
	// Layer names the layer (gpkg: all when empty; geojson: required) or
	// the raster (geotiff: required for a run, optional for a batch of one
	// case).
	Layer string
	// Time of a run's state, s; NaN for the end.
	Time float64
	// Out is the file (vtk: the folder) to write; it is replaced only
	// with Force. StdoutName writes the file to Stdout instead.
	Out    string
	Force  bool
	Stdout io.Writer
}

// Export writes one file from a run or batch folder. It returns the notes
// of a run read back (a stopped run, recovered or damaged frames; see
// Run.Notes), for the caller to show as warnings.
func Export(ctx context.Context, dir string, o ExportOptions) ([]string, error) {
	o.Format = strings.ToLower(o.Format)
	if !slices.Contains(Formats, o.Format) {
		return nil, badinput.Errorf("format %q: use one of %s", o.Format, strings.Join(Formats, ", "))
	}
	switch {
	case o.Out == StdoutName && o.Format == "vtk":
		return nil, badinput.Errorf("--out %s: vtk writes a folder (%s and one .vtp file per time and kind); name the folder", StdoutName, VTKCollectionFile)
	case o.Out == StdoutName && o.Stdout == nil:
		panic("pipeline: Export to standard output without ExportOptions.Stdout")
	case o.Out == StdoutName:
	case o.Format == "vtk":
		if err := (Folder{Dir: o.Out, Force: o.Force}).Check(); err != nil {
			return nil, err
		}
	default:
		if err := outdir.CheckNewFile(o.Out, o.Force); err != nil {
			return nil, err
		}
	}
	switch {
	case IsRunDir(dir) && o.Format == "vtk":
		return exportVTK(dir, o)
	case IsRunDir(dir):
		return exportRun(ctx, dir, o)
	case isBatchDir(dir):
		return nil, exportBatch(ctx, dir, o)
	}
	return nil, badinput.Errorf("%s is neither a run folder (%s, %s) nor a batch folder (%s)", dir, ScenarioFile, SnapshotFile, batch.ManifestName)
}

// writeOut writes the output file atomically, or to o.Stdout.
func writeOut(o ExportOptions, write func(io.Writer) error) error {
	if o.Out == StdoutName {
		return write(o.Stdout)
	}
	return outdir.WriteFile(filepath.Dir(o.Out), filepath.Base(o.Out), write)
}

func exportRun(ctx context.Context, dir string, o ExportOptions) ([]string, error) {
	r, err := LoadRun(dir, o.Time)
	if err != nil {
		return nil, err
	}
	return r.Notes, r.export(ctx, o)
}

// export writes the run's layer, raster or catalogue.
func (r *Run) export(ctx context.Context, o ExportOptions) error {
	pl, err := r.Placement()
	if err != nil {
		return err
	}
	switch o.Format {
	case "gpkg":
		layers, err := r.Layers()
		if err != nil {
			return err
		}
		return writeLayers(ctx, o, pl, layers, scheduleStart(r.Scenario.Schedule.Start))
	case "geojson":
		if o.Layer == "" {
			return badinput.Errorf("geojson writes one layer: choose it with --layer (%s)", strings.Join(LayerNames, ", "))
		}
		l, err := r.Layer(o.Layer)
		if err != nil {
			return badinput.Mark(err)
		}
		if _, err := pl.Geographic(); err != nil {
			return badinput.Mark(err)
		}
		return writeOut(o, func(w io.Writer) error { return gis.WriteGeoJSON(w, pl, l, nil) })
	case "geotiff":
		if o.Layer == "" {
			return badinput.Errorf("geotiff writes one raster: choose it with --layer (%s)", strings.Join(RasterNames, ", "))
		}
		rs, err := r.Raster(o.Layer)
		if err != nil {
			return badinput.Mark(err)
		}
		return writeOut(o, func(w io.Writer) error { return gis.WriteGeoTIFF(w, pl, rs) })
	default: // quakeml
		if _, err := pl.Geographic(); err != nil {
			return badinput.Mark(err)
		}
		return writeOut(o, func(w io.Writer) error { return gis.WriteQuakeML(w, pl, r.catalog()) })
	}
}

// catalog is the run's events as a QuakeML catalogue.
func (r *Run) catalog() gis.Catalog {
	start := scheduleStart(r.Scenario.Schedule.Start)
	c := gis.Catalog{ID: fmt.Sprintf("slipfront-%s-r%d", r.Scenario.Digest[:12], r.Network.Realization), Start: start,
		Description: "synthetic microseismic events of a slipfront run of " + r.Scenario.Name + " (not observed data)"}
	for _, e := range r.Result.Events {
		c.Events = append(c.Events, gis.Event{Time: e.Time, East: e.X, North: e.Y, Depth: e.Depth, Magnitude: e.Magnitude})
	}
	return c
}

// writeLayers writes the layers, or only o.Layer, to a GeoPackage.
func writeLayers(ctx context.Context, o ExportOptions, pl gis.Placement, layers []gis.Layer, stamp time.Time) error {
	if o.Layer != "" {
		l, err := pick(layers, o.Layer)
		if err != nil {
			return err
		}
		layers = []gis.Layer{l}
	}
	if o.Out != StdoutName {
		return writeGeoPackage(ctx, o.Out, pl, layers, stamp) // a new file, renamed over o.Out
	}
	tmp, err := os.MkdirTemp("", "slipfront-export-") // SQLite writes a file, not a stream.
	if err != nil {
		return err
	}
	defer os.RemoveAll(tmp)
	path := filepath.Join(tmp, "export.gpkg")
	if err := writeGeoPackage(ctx, path, pl, layers, stamp); err != nil {
		return err
	}
	return readFile(path, func(r io.Reader) error {
		_, err := io.Copy(o.Stdout, r)
		return err
	})
}

func pick(layers []gis.Layer, name string) (gis.Layer, error) {
	var names []string
	for _, l := range layers {
		if l.Name == name {
			return l, nil
		}
		names = append(names, l.Name)
	}
	return gis.Layer{}, badinput.Errorf("no layer %q; layers: %s", name, strings.Join(names, ", "))
}

func exportBatch(ctx context.Context, dir string, o ExportOptions) error {
	if !math.IsNaN(o.Time) {
		return badinput.Errorf("--time applies to a run folder; a batch folder holds final probabilities")
	}
	m, aggs, err := batch.ReadAggregates(ctx, dir)
	if err != nil {
		return err
	}
	layers, pl, _, err := batchLayers(dir, m, aggs)
	if err != nil {
		return err
	}
	switch o.Format {
	case "gpkg":
		return writeLayers(ctx, o, pl, layers, scheduleStart(m.Scenario.Start))
	case "geojson":
		l, err := pickDefault(layers, len(aggs), o.Layer)
		if err != nil {
			return err
		}
		if _, err := pl.Geographic(); err != nil {
			return badinput.Mark(err)
		}
		return writeOut(o, func(w io.Writer) error { return gis.WriteGeoJSON(w, pl, l, nil) })
	case "geotiff":
		l, err := pickDefault(layers[:len(aggs)], len(aggs), o.Layer)
		if err != nil {
			return err
		}
		for i := range aggs {
			if layers[i].Name == l.Name {
				rs, pl, err := ProbabilityRaster(&aggs[i])
				if err != nil {
					return err
				}
				return writeOut(o, func(w io.Writer) error { return gis.WriteGeoTIFF(w, pl, rs) })
			}
		}
	}
	return badinput.Errorf("a batch folder exports gpkg, geojson or geotiff, not %s (vtk and quakeml export a run's fractures and events)", o.Format)
}

// pickDefault picks the named layer of a batch, or without a name the
// probability layer of its only case (the layers of the cases come first).
func pickDefault(layers []gis.Layer, cases int, name string) (gis.Layer, error) {
	if name == "" && cases == 1 {
		return layers[0], nil
	}
	if name == "" {
		var names []string
		for _, l := range layers[:cases] {
			names = append(names, l.Name)
		}
		return gis.Layer{}, badinput.Errorf("the batch has %d cases: choose one with --layer (%s)", cases, strings.Join(names, ", "))
	}
	return pick(layers, name)
}
