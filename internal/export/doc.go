// Package export turns the results of runs and batches into maps and
// pictures: GeoPackage layers, GeoJSON, GeoTIFF rasters and QuakeML
// catalogues through package gis, and quick-look PNGs through package
// report. It joins the pipeline's later stages (sim and batch results on
// one side, gis and report on the other) so that neither side knows the
// other, and it reads run and batch folders back so maps can be exported
// after the fact.
//
// # Layers of a run
//
//	fractures        LINESTRING  one trace per fracture crossing the layer,
//	                             with set, cluster, slip, aperture, gain,
//	                             first-slip time and stage
//	conduits         LINESTRING  primary conduits, by stage and cluster
//	stimulated_area  MULTIPOLYGON outline of the stimulated cells at every
//	                             snapshot time
//	events           POINT       the synthetic microseismic catalogue
//	wells            LINESTRING  well paths
//	clusters         POINT       perforation clusters with well and stage
//
// # Rasters of a run
//
// first_slip_time (h), pressure_increase (MPa) and cumulative_slip (mm) on
// the scenario's map grid: each cell takes the earliest, largest and
// largest value of the elements passing through it; cells no element
// passes through are NoData.
//
// # Batches
//
// One probability GeoTIFF per sweep case (share of realizations in which
// each cell was stimulated) and a probability layer of 10/50/90 % contours.
package export
