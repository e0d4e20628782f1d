package main

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/spf13/cobra"

	"slipfront/pipeline"
	"slipfront/scenarios"
)

// exportOptions are the flags of "slipfront export".
type exportOptions struct {
	dir  string
	time string
	pipeline.ExportOptions
}

func newExportCmd(g *globalOptions, stderr io.Writer) *cobra.Command {
	var o exportOptions
	cmd := &cobra.Command{
		Use:   "export RUN_OR_BATCH_DIR --format gpkg|geojson|geotiff|quakeml|vtk [--layer NAME] [--time T] --out FILE|DIR|-",
		Short: "Write maps of a run or batch folder for a GIS (GeoPackage, GeoJSON, GeoTIFF, QuakeML) or a 3-D viewer (VTK)",
		Long: "export reads a run folder (its scenario.json, run.snap and events.csv) at a time T or at the\n" +
			"end, or a batch folder, and writes one file in the scenario's projected CRS (GeoJSON and\n" +
			"QuakeML: WGS 84 longitude/latitude); --out - writes it to standard output. The format is\n" +
			"case-insensitive.\n\n" +
			"vtk writes a folder for ParaView: " + pipeline.VTKCollectionFile + ", a collection over every snapshot time\n" +
			"(only T with --time), and per time fractures_NNNN.vtp (the fractures crossing the layer as 3-D\n" +
			"polygons: " + strings.Join(pipeline.VTKFractureFields, ", ") + ")\n" +
			"and events_NNNN.vtp (the events so far as points: " + strings.Join(pipeline.VTKEventFields, ", ") + "),\n" +
			"x and y in the CRS with the origin applied, z the elevation, all in the CRS's unit.\n\n" +
			"Run layers: " + strings.Join(pipeline.LayerNames, ", ") + ", and " + pipeline.StressLayerName + " after production ([depletion])\n" +
			"Run rasters: " + strings.Join(pipeline.RasterNames, ", ") + "\n" +
			"Batch layers and rasters: probability_NNNN (one per sweep case)\n\n" + caution,
		Example: "  slipfront export slipfront-demo --format gpkg --out demo.gpkg\n" +
			"  slipfront export slipfront-demo --format geojson --layer stimulated_area --time 2h --out area-2h.geojson\n" +
			"  slipfront export slipfront-demo --format geotiff --layer first_slip_time --out first-slip.tif\n" +
			"  slipfront export slipfront-demo --format quakeml --out events.xml\n" +
			"  slipfront export slipfront-demo --format vtk --out demo-vtk\n" +
			"  slipfront export slipfront-demo --format GeoJSON --layer events --out - | head\n" +
			"  slipfront export visc --format geotiff --layer probability_0002 --out p-20cp.tif",
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.dir = args[0]
			o.Time = math.NaN()
			if o.time != "" {
				t, err := scenarios.ParseDuration(o.time)
				if err != nil {
					return badInput(fmt.Errorf("--time %s: %w", o.time, err))
				}
				o.Time = t
			}
			o.Stdout = cmd.OutOrStdout()
			notes, err := pipeline.Export(cmd.Context(), o.dir, o.ExportOptions)
			for _, n := range notes {
				fmt.Fprintln(stderr, "warning:", n)
			}
			if err == nil && o.Out != pipeline.StdoutName {
				fmt.Fprintf(statusWriter(g, stderr), "wrote %s\n", o.Out)
			}
			return err
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.Format, "format", "", "gpkg, geojson, geotiff, quakeml or vtk, any letter case (required)")
	f.StringVar(&o.Layer, "layer", "", "layer or raster to write (see above)")
	f.StringVar(&o.time, "time", "", "time of a run's state, with unit (e.g. 90min, 2h); default the end")
	f.StringVarP(&o.Out, "out", "o", "", "file to write, - for standard output; vtk: the folder (required)")
	f.BoolVar(&o.Force, "force", false, "replace an existing file or vtk folder")
	cmd.MarkFlagRequired("format")
	cmd.MarkFlagRequired("out")
	return cmd
}
