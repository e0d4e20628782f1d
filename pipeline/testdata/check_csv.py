"""Check that every CSV file under a folder is plain CSV that Python's csv
module and numpy's genfromtxt(names=True) read, and that it is described by
the W3C CSV on the Web metadata (csv-metadata.json) of its own folder.

Usage: check_csv.py FOLDER

Prints one JSON object: {"tables": {path: rows}} with paths relative to
FOLDER, or {"errors": [...]} listing every problem. Run by
pipeline/csvw_test.go with Debian's /usr/bin/python3 (python3-numpy).
"""
import csv
import json
import os
import sys
import warnings

import numpy as np

DATATYPES = {"double", "integer", "string", "boolean", "dateTime"}


def check_value(datatype, text):
    """Return an error message when text is not a value of datatype."""
    if text == "":  # the CSVW default null
        return None
    try:
        if datatype == "double":
            float(text)
        elif datatype == "integer":
            int(text)
        elif datatype == "boolean" and text not in ("true", "false"):
            return "not a boolean"
    except ValueError:
        return "not a " + datatype
    return None


def check_table(folder, path, table, errors):
    """Check one CSV file against its table description; return its rows."""
    columns = table["tableSchema"]["columns"]
    titles = [c["titles"] for c in columns]
    for c in columns:
        if c["datatype"] not in DATATYPES or not c.get("name") or not c.get("dc:description"):
            errors.append("%s: column %s: datatype, name or description missing" % (path, c.get("titles")))
    with open(os.path.join(folder, path), newline="", encoding="utf-8") as f:
        text = f.read()
    if text.startswith("#") or "\n#" in text:
        errors.append("%s: a comment line" % path)
    reader = csv.DictReader(text.splitlines())
    if reader.fieldnames != titles:
        errors.append("%s: header %s, metadata %s" % (path, reader.fieldnames, titles))
    rows = 0
    for row in reader:
        rows += 1
        if None in row or None in row.values():
            errors.append("%s row %d: not one field per column" % (path, rows))
            break
        for c in columns:
            msg = check_value(c["datatype"], row[c["titles"]])
            if msg:
                errors.append("%s row %d, %s = %r: %s" % (path, rows, c["titles"], row[c["titles"]], msg))
                break
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        try:
            a = np.genfromtxt(os.path.join(folder, path), delimiter=",", names=True, dtype=None, encoding="utf-8")
        except Exception as e:  # noqa: BLE001 - report any failure
            errors.append("%s: numpy genfromtxt: %s" % (path, e))
            return rows
    if len(a.dtype.names) != len(titles) or np.atleast_1d(a).shape[0] != rows:
        errors.append("%s: genfromtxt read %d columns and %d rows, csv %d and %d"
                      % (path, len(a.dtype.names), np.atleast_1d(a).shape[0], len(titles), rows))
    return rows


def main(folder):
    errors, tables, described = [], {}, set()
    for dirpath, _, files in os.walk(folder):
        if "csv-metadata.json" not in files:
            continue
        with open(os.path.join(dirpath, "csv-metadata.json"), encoding="utf-8") as f:
            meta = json.load(f)
        if meta.get("@context", [None])[0] != "http://www.w3.org/ns/csvw":
            errors.append("%s: not a CSVW metadata document" % dirpath)
        for table in meta["tables"]:
            path = os.path.relpath(os.path.join(dirpath, table["url"]), folder)
            described.add(path)
            if not os.path.exists(os.path.join(folder, path)):
                errors.append("%s: described but missing" % path)
                continue
            tables[path] = check_table(folder, path, table, errors)
    for dirpath, _, files in os.walk(folder):
        for name in files:
            path = os.path.relpath(os.path.join(dirpath, name), folder)
            if name.endswith(".csv") and path not in described:
                errors.append("%s: not described by the csv-metadata.json of its folder" % path)
    print(json.dumps({"errors": errors} if errors else {"tables": tables}))


if __name__ == "__main__":
    main(sys.argv[1])
