// Package pipeline runs slipfront's stages into output folders and reads
// the folders back: it is the one owner of the generate, screen and run
// folders (the names it writes are the names it reads), of the batch
// runner's realization function, and of the maps and pictures made from
// run and batch folders.
//
// The commands of cmd/slipfront translate flags into calls of [Generate],
// [Screen], [Simulate], [Realization] (a batch.RunFunc), [Export],
// [WriteReport] and [WriteBatchMaps]. It joins the pipeline's later stages
// (sim and batch results on one side, gis and report on the other) so that
// neither side knows the other.
//
// # Folders
//
//	generate  fractures.csv, traces.csv, network.json, csv-metadata.json
//	screen    screen.csv, screen.json, slip-vs-dp.csv, csv-metadata.json
//	run       scenario.json (written first), run.snap (frame by frame),
//	          summary.json, timeline.csv, events.csv, fractures.csv,
//	          csv-metadata.json, maps.gpkg, map.png, growth.png
//	batch     the files of package batch, and for a complete batch
//	          maps.gpkg, probability_NNNN.tif,
//	          probability_difference_NNNN_vs_RRRR.tif, fan_NNNN.png,
//	          comparison.png
//	report    the pictures of the folder reported on and index.html
//
// Every file but run.snap is written under a temporary name and renamed
// when complete (package internal/outdir). csv-metadata.json describes
// the folder's CSV files in the W3C CSV on the Web vocabulary (package
// internal/csvw; Conventions states the units and names they share).
//
// # Layers of a run
//
//	fractures        LINESTRING  one trace per fracture crossing the layer,
//	                             with set, network cluster, dip, dip
//	                             direction, trace length, slip, aperture,
//	                             gain, first-slip time and stage
//	conduits         LINESTRING  primary conduits (elements) with aperture
//	stimulated_area  MULTIPOLYGON outline of the stimulated cells at every
//	                             snapshot time (time_s, utc_time)
//	events           POINT       the synthetic microseismic catalogue
//	wells            LINESTRING  well paths
//	clusters         POINT       perforation clusters with well and stage
//
// Field names and units are those of the CSV files: times in s (and UTC
// date-times from schedule.start), slip and aperture in mm, depth
// positive down.
//
// # Rasters of a run
//
// first_slip_time (s), pressure_increase (MPa) and cumulative_slip (mm) on
// the scenario's map grid: each cell takes the earliest, largest and
// largest value of the elements passing through it; cells no element
// passes through are NoData. Each band carries its description
// (first_slip_time_s, pressure_increase_MPa, cumulative_slip_mm) and unit.
//
// # Batches
//
// One probability GeoTIFF per sweep case (share of realizations in which
// each cell was stimulated, band stimulation_probability), one per
// pairing of a case with its reference case (the case's probability minus
// the reference's, band stimulation_probability_difference) and a
// probability layer of 10/50/90 % contours.
//
// # Errors
//
// Requests a folder cannot satisfy (a time beyond the run, an unknown
// layer, a folder that is neither a run nor a batch, one that mixes two
// runs) match badinput.Err.
package pipeline
