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
//	generate  scenario.json, fractures.csv, traces.csv, network.json,
//	          csv-metadata.json
//	screen    scenario.json, screen.csv, screen.json, slip-vs-dp.csv,
//	          csv-metadata.json, stereonet-slip-tendency.png,
//	          stereonet-critical-pressure.png, mohr.png, slip-shares.png,
//	          map-critical-pressure.png
//	run       scenario.json (written first), run.snap (frame by frame),
//	          summary.json, timeline.csv, events.csv, fractures.csv,
//	          csv-metadata.json, maps.gpkg, map.png, growth.png,
//	          stress_change.tif, distance-time.png and
//	          magnitude-frequency.png (with events), section_NNNN.png
//	          (per well)
//	batch     the files of package batch, and for a complete batch
//	          maps.gpkg, probability_NNNN.tif and .png,
//	          probability_difference_NNNN_vs_RRRR.tif and .png,
//	          fan_NNNN.png, fans.png, comparison.png, paired-ratios.png
//	report    the pictures of the folder reported on (a generate
//	          folder's: network-map.png, stereonet-poles.png) and
//	          index.html, which embeds them
//	vtk       run.pvd, fractures_NNNN.vtp, events_NNNN.vtp (export)
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
// layer, a folder of no known kind, one that mixes two runs or
// scenarios) match badinput.Err.
//
// # References
//
// Aki, K. (1965), "Maximum likelihood estimate of b in the formula
// log N = a − bM and its confidence limits", Bulletin of the Earthquake
// Research Institute 43, 237–239.
//
// Shapiro, S.A., Huenges, E. & Borm, G. (1997), Geophysical Journal
// International 131, F15–F18 (the triggering front r = √(4πDt) of
// injection-induced seismicity).
//
// Shi, Y. & Bolt, B.A. (1982), "The standard error of the
// magnitude-frequency b value", Bulletin of the Seismological Society of
// America 72(5), 1677–1687.
//
// Wiemer, S. & Wyss, M. (2000), "Minimum magnitude of completeness in
// earthquake catalogs: examples from Alaska, the western United States,
// and Japan", Bulletin of the Seismological Society of America
// 90(4), 859–869.
//
// Willis-Richards, J., Watanabe, K. & Takahashi, H. (1996), "Progress
// toward a stochastic rock mechanics model of engineered geothermal
// systems", Journal of Geophysical Research 101(B8), 17481–17496.
//
// Woessner, J. & Wiemer, S. (2005), "Assessing the quality of earthquake
// catalogues: estimating the magnitude of completeness and its
// uncertainty", Bulletin of the Seismological Society of America 95(2),
// 684–698.
//
// The bibliographic details are those of packages mechanics and report;
// the number of bootstrap resamples (200) is from memory of Woessner &
// Wiemer's practice.
package pipeline
