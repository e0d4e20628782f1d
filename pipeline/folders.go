package pipeline

import (
	"fmt"
	"io"
	"regexp"
	"slices"

	"slipfront/batch"
	"slipfront/internal/outdir"
)

// Files of a generate folder (Generate; also ScenarioFile), and the
// pictures a report of one draws.
const (
	NetworkFracturesFile = "fractures.csv"
	TracesFile           = "traces.csv"
	NetworkFile          = "network.json"
	NetworkMapFile       = "network-map.png"
	PolesPictureFile     = "stereonet-poles.png"
)

// Files of a screen folder (Screen; also ScenarioFile).
const (
	ScreenTableFile   = "screen.csv"
	ScreenSummaryFile = "screen.json"
	SlipCurveFile     = "slip-vs-dp.csv"
	// Pictures: poles coloured by slip tendency and by Δp_c, the Mohr
	// diagram, the slipping shares against Δp and the map of traces by
	// Δp_c.
	SlipTendencyNetFile   = "stereonet-slip-tendency.png"
	CriticalNetFile       = "stereonet-critical-pressure.png"
	MohrPictureFile       = "mohr.png"
	SlipSharesPictureFile = "slip-shares.png"
	CriticalMapFile       = "map-critical-pressure.png"
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
	StressChangeFile  = "stress_change.tif"
	// DepletionFile, RotationFile and CriticalChangeFile are written, by
	// run and by screen, when the scenario produces from parent wells
	// before the stimulation ([depletion]).
	DepletionFile      = "depletion.tif"
	RotationFile       = "shmax_rotation.tif"
	CriticalChangeFile = "critical_pressure_change.tif"
	// CrossingsFile is written by run when fractures grow.
	CrossingsFile = "crossings.csv"
	// RateEventsFile is written by run with a [seismicity_rate] table.
	RateEventsFile = "rate_events.csv"
	// DistanceTimeFile and MagnitudeFrequencyFile are written when the run
	// has events (at least two above the completeness magnitude for the
	// latter); one sectionPictureFile per well.
	DistanceTimeFile       = "distance-time.png"
	MagnitudeFrequencyFile = "magnitude-frequency.png"
	// ContentsFile, written last, lists every other file of a complete
	// run folder with its size and SHA-256; see RunContents.
	ContentsFile = "contents.json"
)

// Files that WriteBatchMaps adds to a complete batch folder (beside those
// of package batch, and the per-case files named below), and the page of
// a report folder.
const (
	ComparisonPictureFile = "comparison.png"
	FanPanelsPictureFile  = "fans.png"
	PairedRatiosFile      = "paired-ratios.png"
	ReportPageFile        = "index.html"
)

// Files of a VTK export folder (ExportOptions.Format "vtk"): the
// collection and, per snapshot time k, vtkFracturesFile(k) and
// vtkEventsFile(k).
const VTKCollectionFile = "run.pvd"

// sectionPictureFile is the vertical section along well w (scenario
// order).
func sectionPictureFile(w int) string { return fmt.Sprintf("section_%04d.png", w) }

// fanPictureFile is the fan chart of batch case c.
func fanPictureFile(c int) string { return fmt.Sprintf("fan_%04d.png", c) }

// probabilityRasterFile is the probability GeoTIFF of batch case c;
// probabilityPictureFile its map.
func probabilityRasterFile(c int) string  { return fmt.Sprintf("probability_%04d.tif", c) }
func probabilityPictureFile(c int) string { return fmt.Sprintf("probability_%04d.png", c) }

// probabilityDifferenceFile is the GeoTIFF of the stimulation probability
// of batch case c minus that of its reference case ref;
// differencePictureFile its map.
func probabilityDifferenceFile(c, ref int) string {
	return fmt.Sprintf("probability_difference_%04d_vs_%04d.tif", c, ref)
}
func differencePictureFile(c, ref int) string {
	return fmt.Sprintf("probability_difference_%04d_vs_%04d.png", c, ref)
}

// vtkFracturesFile and vtkEventsFile are the fractures and the events of
// snapshot time k of a VTK export folder.
func vtkFracturesFile(k int) string { return fmt.Sprintf("fractures_%04d.vtp", k) }
func vtkEventsFile(k int) string    { return fmt.Sprintf("events_%04d.vtp", k) }

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
	NetworkFracturesFile, TracesFile, NetworkFile, NetworkMapFile, PolesPictureFile,
	ScreenTableFile, ScreenSummaryFile, SlipCurveFile,
	SlipTendencyNetFile, CriticalNetFile, MohrPictureFile, SlipSharesPictureFile, CriticalMapFile,
	ScenarioFile, SnapshotFile, SummaryFile, TimelineFile, EventsFile, FracturesFile, ContentsFile,
	CSVMetadataFile, MapsFile, MapPictureFile, GrowthPictureFile, DistanceTimeFile, MagnitudeFrequencyFile,
	StressChangeFile, DepletionFile, RotationFile, CriticalChangeFile, CrossingsFile, RateEventsFile,
	ComparisonPictureFile, FanPanelsPictureFile, PairedRatiosFile, ReportPageFile,
	VTKCollectionFile,
}

// caseFile matches the numbered files: per batch case, per well, per
// VTK snapshot time.
var caseFile = regexp.MustCompile(`^((fan|probability|section)_[0-9]{4}\.png|probability_[0-9]{4}\.tif|` +
	`probability_difference_[0-9]{4}_vs_[0-9]{4}\.(png|tif)|(fractures|events)_[0-9]{4}\.vtp)$`)

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
