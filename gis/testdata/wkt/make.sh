#!/bin/sh
# Regenerates the WKT test files with PROJ's projinfo (proj-bin). Files
# named by an EPSG code are the dataset's definitions; the others are
# made-up projected CRSs (no EPSG identifier) written from PROJ strings.
#
# Usage: cd gis/testdata/wkt && sh make.sh
set -eu
v=$(projinfo 2>&1 | head -n 1)
w() { # format file crs
  { projinfo -o "$1" -q "$3"; } > "$2"
}
w WKT1_GDAL 2277.wkt1.prj EPSG:2277
w WKT2_2019 2277.wkt2.prj EPSG:2277
w WKT1_ESRI 2277.esri.prj EPSG:2277
w WKT2_2019 32614.wkt2.prj EPSG:32614
w WKT1_GDAL 32039.wkt1.prj EPSG:32039
w WKT2_2015 6588.wkt2-2015.prj EPSG:6588
w WKT2_2019 2056.wkt2.prj EPSG:2056
w WKT2_2019 4326.wkt2.prj EPSG:4326
w WKT2_2019 lcc1sp-ftus.wkt2.prj "+proj=lcc +lat_1=40.5 +lat_0=40.5 +lon_0=-104.5 +k_0=0.9999 +x_0=300000 +y_0=50000 +ellps=GRS80 +units=us-ft +type=crs"
w WKT1_ESRI lcc1sp-ftus.esri.prj "+proj=lcc +lat_1=40.5 +lat_0=40.5 +lon_0=-104.5 +k_0=0.9999 +x_0=300000 +y_0=50000 +ellps=GRS80 +units=us-ft +type=crs"
w WKT1_GDAL tm-ftus-nad83.wkt1.prj "+proj=tmerc +lat_0=31 +lon_0=-103.5 +k=0.9999 +x_0=200000 +y_0=0 +datum=NAD83 +units=us-ft +type=crs"
w WKT1_GDAL lcc2sp-intl-towgs84.wkt1.prj "+proj=lcc +lat_1=33 +lat_2=45 +lat_0=23 +lon_0=-96 +x_0=0 +y_0=0 +ellps=intl +towgs84=0,0,0 +units=m +type=crs"
echo "$v" > VERSION
