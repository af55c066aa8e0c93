"""Writes GRIB2 test files with ecCodes' grib_filter from its own sample regular_ll_sfc_grib2.tmpl (Debian
libeccodes-tools): 2 m temperature (paramId 167, ecCodes parameter database), on a regular 3° x 1.5° grid
lon 0..357, lat -3..-15 (scanning north to south, as ECMWF writes it).

usage: make-grib.py OUT.grib2 MEMBERS STEPS [deterministic]
  MEMBERS  ensemble size (product definition template 4.1, perturbationNumber 0..MEMBERS-1)
  STEPS    comma-separated forecast steps in hours
  deterministic  write template 4.0 (no perturbationNumber) instead; MEMBERS must be 1
The field is smooth plus a deterministic ripple so that every cell, member and step differs.
"""
import math
import subprocess
import sys
import tempfile

out, members, steps = sys.argv[1], int(sys.argv[2]), [int(s) for s in sys.argv[3].split(',')]
deterministic = len(sys.argv) > 4 and sys.argv[4] == 'deterministic'
NI, NJ = 120, 9
rules = []
for m in range(members):
    for step in steps:
        vals = []
        for j in range(NJ):
            lat = -3 - 1.5 * j
            for i in range(NI):
                lon = 3 * i
                vals.append(290 + 5 * math.cos(math.radians(lat)) + 3 * math.sin(math.radians(lon)) + 0.7 * m
                            + 0.05 * step + 2 * math.sin(2 * math.pi * step / 24) + 0.01 * ((7 * i + 3 * j + m) % 11))
        ensemble = '' if deterministic else (
            f'set productDefinitionTemplateNumber=1; set typeOfProcessedData=4; set typeOfGeneratingProcess=4;\n'
            f'set numberOfForecastsInEnsemble={members}; set perturbationNumber={m};\n')
        rules.append(ensemble + f"""set dataDate=20261123; set dataTime=0;
set paramId=167; set typeOfFirstFixedSurface=103; set scaleFactorOfFirstFixedSurface=0; set scaledValueOfFirstFixedSurface=2;
set stepUnits=1; set forecastTime={step};
set Ni={NI}; set Nj={NJ};
set latitudeOfFirstGridPointInDegrees=-3; set latitudeOfLastGridPointInDegrees=-15;
set longitudeOfFirstGridPointInDegrees=0; set longitudeOfLastGridPointInDegrees=357;
set iDirectionIncrementInDegrees=3; set jDirectionIncrementInDegrees=1.5;
set bitsPerValue=24;
set values={{{','.join('%.6f' % v for v in vals)}}};
write;
""")
with tempfile.NamedTemporaryFile('w', suffix='.rules') as f:
    f.write('\n'.join(rules))
    f.flush()
    subprocess.run(['grib_filter', '-o', out, f.name, '/usr/share/eccodes/samples/regular_ll_sfc_grib2.tmpl'], check=True)
