package pipeline

import (
	"fmt"
	"io"

	"slipfront/batch"
	"slipfront/internal/outdir"
)

// Files of a generate folder (Generate).
const (
	NetworkFracturesFile = "fractures.csv"
	TracesFile           = "traces.csv"
	NetworkFile          = "network.json"
)

// Files of a screen folder (Screen).
const (
	ScreenTableFile   = "screen.csv"
	ScreenSummaryFile = "screen.json"
	SlipCurveFile     = "slip-vs-dp.csv"
)

// Files of a run folder (Simulate), read back by LoadRun and WriteReport.
const (
	ScenarioFile      = "scenario.json"
	SnapshotFile      = "run.snap"
	SummaryFile       = "summary.json"
	TimelineFile      = "timeline.csv"
	EventsFile        = "events.csv"
	FracturesFile     = "fractures.csv"
	MapsFile          = "maps.gpkg"
	MapPictureFile    = "map.png"
	GrowthPictureFile = "growth.png"
)

// Files that WriteBatchMaps adds to a complete batch folder (beside those
// of package batch), and the page of a report folder.
const (
	ComparisonPictureFile = "comparison.png"
	ReportPageFile        = "index.html"
)

// fanPictureFile is the fan chart of batch case c.
func fanPictureFile(c int) string { return fmt.Sprintf("fan_%04d.png", c) }

// probabilityRasterFile is the probability GeoTIFF of batch case c.
func probabilityRasterFile(c int) string { return fmt.Sprintf("probability_%04d.tif", c) }

// probabilityDifferenceFile is the GeoTIFF of the stimulation probability
// of batch case c minus that of its reference case ref.
func probabilityDifferenceFile(c, ref int) string {
	return fmt.Sprintf("probability_difference_%04d_vs_%04d.tif", c, ref)
}

// isBatchDir reports whether dir holds a batch (its manifest).
func isBatchDir(dir string) bool { return exists(dir, batch.ManifestName) }

// Folder is an output folder: its path, and whether an existing,
// non-empty folder may be written into (files of the same name are then
// replaced).
type Folder struct {
	Dir   string
	Force bool
}

// Prepare creates the folder, or checks that an existing one may be
// written into.
func (f Folder) Prepare() error { return outdir.Prepare(f.Dir, f.Force) }

// namedWriter is one file of a folder and the function that writes it.
type namedWriter struct {
	name  string
	write func(io.Writer) error
}

// writeFiles writes each file into dir under a temporary name, renamed
// when complete.
func writeFiles(dir string, files ...namedWriter) error {
	for _, f := range files {
		if err := outdir.WriteFile(dir, f.name, f.write); err != nil {
			return err
		}
	}
	return nil
}
