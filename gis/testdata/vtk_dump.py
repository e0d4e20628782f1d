"""Read VTK XML files with the VTK Python bindings and print what they hold
as JSON, for gis/vtk_test.go.

Usage: /usr/bin/python3 vtk_dump.py vtp FILE | pvd FILE

vtp: {"points": [[x, y, z], ...], "verts": [[ids], ...], "polys": [[ids], ...],
      "cell_data": {name: [v, ...]}, "point_data": {name: [v, ...]}}
     NaN values are written as null.
pvd: {"times": [t, ...], "blocks": [number of datasets at each time, ...]},
     after reading every dataset with vtkXMLPolyDataReader.
Needs Debian's python3-vtk9.
"""
import json
import math
import os
import sys
import xml.etree.ElementTree as ET

import vtk
from vtk.util.numpy_support import vtk_to_numpy


def cells(ca):
    out = []
    ids = vtk.vtkIdList()
    ca.InitTraversal()
    while ca.GetNextCell(ids):
        out.append([ids.GetId(i) for i in range(ids.GetNumberOfIds())])
    return out


def arrays(data):
    out = {}
    for i in range(data.GetNumberOfArrays()):
        a = data.GetArray(i)
        out[a.GetName()] = [None if math.isnan(v) else float(v) for v in vtk_to_numpy(a).ravel()]
    return out


def vtp(path):
    r = vtk.vtkXMLPolyDataReader()
    r.SetFileName(path)
    r.Update()
    if r.GetErrorCode() != 0:
        sys.exit("read error %d" % r.GetErrorCode())
    d = r.GetOutput()
    pts = d.GetPoints()
    return {
        "points": [list(pts.GetPoint(i)) for i in range(d.GetNumberOfPoints())] if pts else [],
        "verts": cells(d.GetVerts()),
        "polys": cells(d.GetPolys()),
        "cell_data": arrays(d.GetCellData()),
        "point_data": arrays(d.GetPointData()),
    }


def pvd(path):
    # VTK 9.1's Python bindings wrap no .pvd reader (vtkXMLCollectionReader
    # is not wrapped; vtkPVDReader belongs to ParaView), so the collection
    # is parsed with ElementTree and every dataset it names is opened with
    # VTK's reader, relative to the .pvd file as ParaView resolves it.
    root = ET.parse(path).getroot()
    if root.tag != "VTKFile" or root.get("type") != "Collection":
        sys.exit("not a VTK collection")
    times, blocks = [], []
    for ds in root.find("Collection").findall("DataSet"):
        t = float(ds.get("timestep"))
        vtp(os.path.join(os.path.dirname(path), ds.get("file")))
        if not times or times[-1] != t:
            times.append(t)
            blocks.append(0)
        blocks[-1] += 1
    return {"times": times, "blocks": blocks}


if __name__ == "__main__":
    kind, path = sys.argv[1], sys.argv[2]
    print(json.dumps(vtp(path) if kind == "vtp" else pvd(path)))
