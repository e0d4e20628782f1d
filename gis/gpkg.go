package gis

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"os"
	"strings"
	"time"

	"github.com/paulmach/orb"
	_ "modernc.org/sqlite" // pure-Go SQLite driver "sqlite"
)

// GeoPackage file identification (OGC 12-128r18, Req 2).
const (
	gpkgApplicationID = 0x47504B47 // "GPKG"
	gpkgUserVersion   = 10300      // GeoPackage 1.3
)

// Definitions of the required rows of gpkg_spatial_ref_sys (OGC
// 12-128r18, Req 11). The WGS 84 text reproduces `gdalsrsinfo -o wkt1
// --single-line EPSG:4326` (GDAL 3.6.2, PROJ 9.1.1).
const (
	wktWGS84Geographic = `GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AXIS["Latitude",NORTH],AXIS["Longitude",EAST],AUTHORITY["EPSG","4326"]]`
	wktUndefined       = "undefined"
)

// srsIDUserDefined is the srs_id of a WKT CRS without an EPSG
// identifier: the first id GDAL gives user-defined CRSs, above the EPSG
// codes of CRSs (common practice, no source).
const srsIDUserDefined = 100000

// gpkgSRS is a row of gpkg_spatial_ref_sys.
type gpkgSRS struct {
	name         string
	id           int
	organization string
	orgID        int
	definition   string
}

// srsRow returns the row of a CRS definition (nil: the undefined
// Cartesian frame). A code of the table gets GDAL's WKT1; a WKT CRS its
// own text, under its EPSG identifier if it has one.
func srsRow(d *crsDef) gpkgSRS {
	switch {
	case d == nil:
		return gpkgSRS{"Undefined cartesian SRS", srsIDUndefinedCartesian, "NONE", srsIDUndefinedCartesian, wktUndefined}
	case d.wkt == "":
		e, _ := lookupEPSG(d.epsg)
		return gpkgSRS{d.name, d.epsg, "EPSG", d.epsg, e.wkt1()}
	case d.epsg != 0:
		return gpkgSRS{d.name, d.epsg, "EPSG", d.epsg, d.wkt}
	}
	return gpkgSRS{d.name, srsIDUserDefined, "NONE", srsIDUserDefined, d.wkt}
}

// gpkgTimeFormat is the DATETIME format of GeoPackage (OGC 12-128r18,
// Req 5: ISO-8601 'YYYY-MM-DDTHH:MM:SS.SSSZ', UTC).
const gpkgTimeFormat = "2006-01-02T15:04:05.000Z"

// Mandatory tables (OGC 12-128r18, Table 21, 22 and 23 definitions).
const gpkgSchema = `
CREATE TABLE gpkg_spatial_ref_sys (
  srs_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL PRIMARY KEY,
  organization TEXT NOT NULL,
  organization_coordsys_id INTEGER NOT NULL,
  definition TEXT NOT NULL,
  description TEXT);
CREATE TABLE gpkg_contents (
  table_name TEXT NOT NULL PRIMARY KEY,
  data_type TEXT NOT NULL,
  identifier TEXT UNIQUE,
  description TEXT DEFAULT '',
  last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
  min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE,
  srs_id INTEGER,
  CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id));
CREATE TABLE gpkg_geometry_columns (
  table_name TEXT NOT NULL,
  column_name TEXT NOT NULL,
  geometry_type_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL,
  z TINYINT NOT NULL,
  m TINYINT NOT NULL,
  CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name),
  CONSTRAINT uk_gc_table_name UNIQUE (table_name),
  CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
  CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id));
`

// GeoPackageOptions adjusts WriteGeoPackage. The zero value is ready.
type GeoPackageOptions struct {
	// LastChange is written to gpkg_contents.last_change; zero means the
	// current time.
	LastChange time.Time
}

// WriteGeoPackage writes layers (in local coordinates, placed by pl) to a
// new GeoPackage 1.3 file at path. It fails if path exists: SQLite needs a
// file path, so the caller writes to a temporary name and renames it when
// this returns nil. On error the partial file is removed.
//
// Each layer becomes a feature table with columns fid (INTEGER PRIMARY KEY
// AUTOINCREMENT), geom (the layer's geometry type) and the fields, all in
// one transaction. A nil or empty geometry is stored as NULL. No spatial
// index is written (GDAL's CreateSpatialIndex can add one).
//
// Coordinates are in the CRS's unit (see Placement). The CRS goes into
// gpkg_spatial_ref_sys: an EPSG code with GDAL's WKT1 of it; a WKT CRS
// with its own text (compacted to one line), under its EPSG identifier if
// it has one, else as srs_id 100000 of organization NONE.
func WriteGeoPackage(ctx context.Context, path string, pl Placement, layers []Layer, opt *GeoPackageOptions) (err error) {
	if err := validateLayers(layers); err != nil {
		return err
	}
	// The driver reads anything after '?' as connection options.
	if strings.Contains(path, "?") || path == "" {
		return fmt.Errorf("gis: GeoPackage path %q: must be non-empty and without '?'", path)
	}
	if _, err := os.Lstat(path); err == nil {
		return fmt.Errorf("gis: GeoPackage %s already exists", path)
	} else if !errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("gis: GeoPackage %s: %w", path, err)
	}
	def, toCRS, err := pl.resolve()
	if err != nil {
		return fmt.Errorf("gis: GeoPackage %s: %w", path, err)
	}
	lastChange := time.Now()
	if opt != nil && !opt.LastChange.IsZero() {
		lastChange = opt.LastChange
	}
	db, err := sql.Open("sqlite", path)
	if err != nil {
		return fmt.Errorf("gis: opening GeoPackage %s: %w", path, err)
	}
	db.SetMaxOpenConns(1)
	defer func() {
		if cerr := db.Close(); err == nil && cerr != nil {
			err = fmt.Errorf("gis: closing GeoPackage %s: %w", path, cerr)
		}
		if err != nil {
			os.Remove(path)
		}
	}()
	w := gpkgWriter{srs: srsRow(def), toCRS: toCRS, lastChange: lastChange.UTC().Format(gpkgTimeFormat)}
	if err := w.write(ctx, db, layers); err != nil {
		return fmt.Errorf("gis: writing GeoPackage %s: %w", path, err)
	}
	return nil
}

// gpkgWriter holds the state shared by the steps of one GeoPackage write.
type gpkgWriter struct {
	srs        gpkgSRS                   // the layers' CRS
	toCRS      func(orb.Point) orb.Point // local to CRS coordinates
	lastChange string                    // ISO-8601 UTC
}

func (w *gpkgWriter) write(ctx context.Context, db *sql.DB, layers []Layer) error {
	pragmas := fmt.Sprintf("PRAGMA application_id = %d; PRAGMA user_version = %d;", gpkgApplicationID, gpkgUserVersion)
	if _, err := db.ExecContext(ctx, pragmas); err != nil {
		return err
	}
	tx, err := db.BeginTx(ctx, nil)
	if err != nil {
		return err
	}
	defer tx.Rollback() // no-op after Commit
	if _, err := tx.ExecContext(ctx, gpkgSchema); err != nil {
		return err
	}
	if err := w.writeSRS(ctx, tx); err != nil {
		return err
	}
	for i := range layers {
		if err := w.writeLayer(ctx, tx, &layers[i]); err != nil {
			return fmt.Errorf("layer %q: %w", layers[i].Name, err)
		}
	}
	return tx.Commit()
}

// writeSRS inserts the three required rows (OGC 12-128r18, Req 11) and
// the layers' CRS.
func (w *gpkgWriter) writeSRS(ctx context.Context, tx *sql.Tx) error {
	const ins = `INSERT INTO gpkg_spatial_ref_sys
	  (srs_name, srs_id, organization, organization_coordsys_id, definition, description)
	  VALUES (?, ?, ?, ?, ?, ?)`
	rows := [][]any{
		{"Undefined cartesian SRS", srsIDUndefinedCartesian, "NONE", srsIDUndefinedCartesian, wktUndefined, "undefined cartesian coordinate reference system"},
		{"Undefined geographic SRS", srsIDUndefinedGeographic, "NONE", srsIDUndefinedGeographic, wktUndefined, "undefined geographic coordinate reference system"},
		{"WGS 84 geodetic", epsgWGS84Geographic, "EPSG", epsgWGS84Geographic, wktWGS84Geographic, "longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid"},
	}
	if r := w.srs; r.id != srsIDUndefinedCartesian {
		rows = append(rows, []any{r.name, r.id, r.organization, r.orgID, r.definition, r.name})
	}
	for _, r := range rows {
		if _, err := tx.ExecContext(ctx, ins, r...); err != nil {
			return err
		}
	}
	return nil
}

// writeLayer creates the feature table of l, registers it in gpkg_contents
// and gpkg_geometry_columns, and inserts its features.
func (w *gpkgWriter) writeLayer(ctx context.Context, tx *sql.Tx, l *Layer) error {
	srsID := w.srs.id
	var cols strings.Builder
	fmt.Fprintf(&cols, `CREATE TABLE "%s" (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, geom %s`, l.Name, l.Geometry)
	for _, f := range l.Fields {
		fmt.Fprintf(&cols, `, "%s" %s`, f.Name, f.Type.sqlType())
	}
	cols.WriteString(")")
	if _, err := tx.ExecContext(ctx, cols.String()); err != nil {
		return err
	}

	blobs, ext, err := w.encodeFeatures(l, int32(srsID))
	if err != nil {
		return err
	}
	var minX, minY, maxX, maxY any // NULL for a layer without geometry
	if ext != nil {
		minX, minY, maxX, maxY = ext.Min[0], ext.Min[1], ext.Max[0], ext.Max[1]
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO gpkg_contents
	  (table_name, data_type, identifier, description, last_change, min_x, min_y, max_x, max_y, srs_id)
	  VALUES (?, 'features', ?, ?, ?, ?, ?, ?, ?, ?)`,
		l.Name, l.Name, l.Description, w.lastChange, minX, minY, maxX, maxY, srsID); err != nil {
		return err
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO gpkg_geometry_columns
	  (table_name, column_name, geometry_type_name, srs_id, z, m) VALUES (?, 'geom', ?, ?, 0, 0)`,
		l.Name, l.Geometry.String(), srsID); err != nil {
		return err
	}
	return w.insertFeatures(ctx, tx, l, blobs)
}

// encodeFeatures returns the GeoPackageBinary blob of every feature (nil
// for no geometry) and the extent of the layer in CRS coordinates (nil if
// no feature has a point).
func (w *gpkgWriter) encodeFeatures(l *Layer, srsID int32) ([][]byte, *orb.Bound, error) {
	blobs := make([][]byte, len(l.Features))
	var ext *orb.Bound
	for i, ft := range l.Features {
		if ft.Geometry == nil || isEmpty(ft.Geometry) {
			continue // NULL; see encodeGPKGGeometry
		}
		g := mapGeometry(ft.Geometry, w.toCRS)
		b, err := encodeGPKGGeometry(g, srsID)
		if err != nil {
			return nil, nil, fmt.Errorf("feature %d: %w", i, err)
		}
		blobs[i] = b
		if gb, ok := bounds(g); ok {
			if ext == nil {
				ext = &gb
			} else {
				*ext = ext.Union(gb)
			}
		}
	}
	return blobs, ext, nil
}

func (w *gpkgWriter) insertFeatures(ctx context.Context, tx *sql.Tx, l *Layer, blobs [][]byte) error {
	var q strings.Builder
	fmt.Fprintf(&q, `INSERT INTO "%s" (geom`, l.Name)
	for _, f := range l.Fields {
		fmt.Fprintf(&q, `, "%s"`, f.Name)
	}
	q.WriteString(") VALUES (?" + strings.Repeat(", ?", len(l.Fields)) + ")")
	stmt, err := tx.PrepareContext(ctx, q.String())
	if err != nil {
		return err
	}
	defer stmt.Close()
	args := make([]any, 1+len(l.Fields))
	for i, ft := range l.Features {
		args[0] = nil
		if blobs[i] != nil {
			args[0] = blobs[i]
		}
		for j, v := range ft.Values {
			nv, err := normalizeValue(l.Fields[j].Type, v)
			if err != nil {
				panic("gis: value changed after validation: " + err.Error())
			}
			if t, ok := nv.(time.Time); ok {
				nv = t.Format(gpkgTimeFormat)
			}
			args[1+j] = nv
		}
		if _, err := stmt.ExecContext(ctx, args...); err != nil {
			return fmt.Errorf("feature %d: %w", i, err)
		}
	}
	return nil
}
