package pipeline

import (
	"context"
	"time"

	"slipfront/gis"
	"slipfront/internal/outdir"
)

// writeGeoPackage writes layers to path through a temporary file, replacing
// path only when the file is complete. The layers' last_change is stamp
// (a time of the scenario, never the clock, so that equal inputs give
// equal bytes).
func writeGeoPackage(ctx context.Context, path string, pl gis.Placement, layers []gis.Layer, stamp time.Time) error {
	tmp, err := outdir.TempPath(path)
	if err != nil {
		return err
	}
	if err := gis.WriteGeoPackage(ctx, tmp, pl, layers, &gis.GeoPackageOptions{LastChange: stamp}); err != nil {
		return err
	}
	return outdir.Commit(tmp, path)
}

// scheduleStart is the scenario's start of pumping (validated RFC 3339),
// or the Unix epoch when there is none.
func scheduleStart(start string) time.Time {
	t, err := time.Parse(time.RFC3339, start)
	if err != nil {
		return time.Unix(0, 0).UTC()
	}
	return t
}
