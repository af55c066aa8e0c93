"""Reference CF-decoded values from netCDF4-python (Unidata), auto mask and scale on (its default).

Usage: /usr/bin/python3 test/read-low/netcdf4-decoded.py FILE VAR [VAR ...]
Prints JSON {VAR: [value or null (masked), ...]} in C order.
"""
import json
import sys

import netCDF4
import numpy

path, names = sys.argv[1], sys.argv[2:]
out = {}
with netCDF4.Dataset(path) as ds:
    for name in names:
        data = numpy.ma.masked_invalid(numpy.ma.asarray(ds.variables[name][...], dtype=numpy.float64)).ravel()
        out[name] = [None if m else float(v) for v, m in zip(data.data, numpy.ma.getmaskarray(data))]
print(json.dumps(out))
