package export

import (
	"context"
	"io"
	"path/filepath"

	"slipfront/gis"
	"slipfront/internal/outdir"
	"slipfront/report"
)

// WriteRunMaps writes maps.gpkg, map.png and growth.png of a finished
// run into dir, each under a temporary name first.
func WriteRunMaps(ctx context.Context, dir string, r *Run) error {
	pl, err := r.Placement()
	if err != nil {
		return err
	}
	layers, err := r.Layers()
	if err != nil {
		return err
	}
	if err := WriteGeoPackage(ctx, filepath.Join(dir, "maps.gpkg"), pl, layers); err != nil {
		return err
	}
	m, err := r.MapPicture()
	if err != nil {
		return err
	}
	if err := outdir.WriteFile(dir, "map.png", func(w io.Writer) error { return m.WritePNG(w, report.Size{}) }); err != nil {
		return err
	}
	g := r.GrowthPicture()
	return outdir.WriteFile(dir, "growth.png", func(w io.Writer) error { return g.WritePNG(w, report.Size{}) })
}

// WriteGeoPackage writes layers to path through a temporary file, replacing
// path only when the file is complete.
func WriteGeoPackage(ctx context.Context, path string, pl gis.Placement, layers []gis.Layer) error {
	tmp, err := outdir.TempPath(path)
	if err != nil {
		return err
	}
	if err := gis.WriteGeoPackage(ctx, tmp, pl, layers, nil); err != nil {
		return err
	}
	return outdir.Commit(tmp, path)
}
