package pipeline

import (
	"context"

	"slipfront/gis"
	"slipfront/internal/outdir"
)

// writeGeoPackage writes layers to path through a temporary file, replacing
// path only when the file is complete.
func writeGeoPackage(ctx context.Context, path string, pl gis.Placement, layers []gis.Layer) error {
	tmp, err := outdir.TempPath(path)
	if err != nil {
		return err
	}
	if err := gis.WriteGeoPackage(ctx, tmp, pl, layers, nil); err != nil {
		return err
	}
	return outdir.Commit(tmp, path)
}
