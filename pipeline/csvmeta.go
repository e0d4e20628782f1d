package pipeline

import (
	"fmt"

	"slipfront/dfn"
	"slipfront/internal/csvw"
	"slipfront/internal/version"
	"slipfront/mechanics"
	"slipfront/scenarios"
	"slipfront/sim"
)

// CSVMetadataFile describes the CSV files of a generate, screen, run or
// batch folder (W3C CSV on the Web metadata; package csvw).
const CSVMetadataFile = csvw.FileName

// Conventions is the paragraph of every folder's CSV metadata that states
// the units and names shared by all outputs.
const Conventions = "Units are SI with the unit in each column name, and one name per quantity across all outputs: " +
	"pressures and stresses in MPa (absolute, compression positive), slip and aperture in mm, times in s since schedule.start, " +
	"lengths in m, areas in m2, volumes in m3; depth_m is true vertical depth, positive down; x_m and y_m are local east and north " +
	"of the scenario origin; stages are named well:stage; fracture_id indexes the realization's network. An empty field is a missing value."

// placement states where the local coordinates of scenario s lie.
func placement(s *scenarios.Scenario) string {
	d := s.Domain
	crs := d.CRS
	switch {
	case d.CRSWKT != "":
		crs = "the CRS of " + d.CRSWKT
	case crs == "":
		return "Local coordinates in an undefined Cartesian frame (the scenario names no CRS)."
	}
	return fmt.Sprintf("Local (0, 0) is easting %g m, northing %g m (in metres, whatever the CRS's unit) in %s; "+
		"local axes are parallel to its grid.", d.OriginEasting, d.OriginNorthing, crs)
}

// csvMetadata is the CSV metadata file of a folder of scenario s.
func csvMetadata(s *scenarios.Scenario, what string, tables ...csvw.Table) namedWriter {
	g := &csvw.Group{
		Title:       fmt.Sprintf("slipfront %s folder of %s", what, s.Name),
		Description: Conventions + " " + placement(s),
		Creator:     "slipfront " + version.Version,
		Tables:      tables,
	}
	return namedWriter{CSVMetadataFile, g.Write}
}

// located returns t with its URL.
func located(t csvw.Table, url string) csvw.Table {
	t.URL = url
	return t
}

func generateMetadata(s *scenarios.Scenario) namedWriter {
	return csvMetadata(s, "generate", located(dfn.FracturesTable, NetworkFracturesFile), located(dfn.TracesTable, TracesFile))
}

func screenMetadata(s *scenarios.Scenario) namedWriter {
	return csvMetadata(s, "screen", located(mechanics.ScreenTable, ScreenTableFile), located(mechanics.CurveTable, SlipCurveFile))
}

func runMetadata(s *scenarios.Scenario) namedWriter {
	tables := []csvw.Table{located(sim.TimelineTable, TimelineFile), located(sim.EventsTable, EventsFile),
		located(sim.FracturesTable, FracturesFile)}
	if sim.Grows(s) {
		tables = append(tables, located(sim.CrossingsTable, CrossingsFile))
	}
	if s.SeismicityRate.Active() {
		tables = append(tables, located(sim.RateEventsTable, RateEventsFile))
	}
	return csvMetadata(s, "run", tables...)
}
