package pipeline

import (
	"fmt"
	"io"
	"regexp"
	"slices"

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
	// ContentsFile, written last, lists every other file of a complete
	// run folder with its size and SHA-256; see RunContents.
	ContentsFile = "contents.json"
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

// Folder is an output folder: its path, and whether an existing folder
// of ours may be replaced. Every stage writes its folder as a whole: into
// the sibling Dir + ".partial" (outdir.PartialSuffix), renamed to Dir when
// complete, so Dir never mixes two outputs; a process killed part way
// leaves the partial folder with what it wrote.
type Folder struct {
	Dir   string
	Force bool
}

// Check reports whether the folder may be written, without touching it.
func (f Folder) Check() error { return outdir.Check(f.Dir, f.Force, ours) }

// begin starts writing the folder through its partial sibling.
func (f Folder) begin() (*outdir.Staged, error) { return outdir.Begin(f.Dir, f.Force, ours) }

// ourFiles are the names of the files of every folder pipeline writes.
var ourFiles = []string{
	NetworkFracturesFile, TracesFile, NetworkFile,
	ScreenTableFile, ScreenSummaryFile, SlipCurveFile,
	ScenarioFile, SnapshotFile, SummaryFile, TimelineFile, EventsFile, FracturesFile, ContentsFile,
	CSVMetadataFile, MapsFile, MapPictureFile, GrowthPictureFile,
	ComparisonPictureFile, ReportPageFile,
}

// caseFile matches the per-case files of batch maps and reports.
var caseFile = regexp.MustCompile(`^((fan|probability)_[0-9]{4}|probability_difference_[0-9]{4}_vs_[0-9]{4})\.(png|tif)$`)

// tempFile matches the temporary files of outdir.WriteFile and TempPath.
var tempFile = regexp.MustCompile(`^\..+\.tmp-[0-9]+$`)

// ours reports whether name is a file pipeline writes into one of its
// folders (--force may replace such a folder, and no other).
func ours(name string) bool {
	return slices.Contains(ourFiles, name) || caseFile.MatchString(name) || tempFile.MatchString(name)
}

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
