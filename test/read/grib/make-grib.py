"""Writes GRIB test files with ecCodes' grib_filter from its own samples (Debian libeccodes-tools):
regular_ll_sfc_grib2.tmpl, or regular_ll_sfc_grib1.tmpl for edition 1, on a regular 3° x 1.5° grid
lon 0..357, lat -3..-15 (scanning north to south, as ECMWF writes it). Parameters (ecCodes parameter database):
paramId 167 = 2t (2 m temperature, instantaneous), 121 = mx2t6 (maximum over the 6 h before each step),
228 = tp (total precipitation in m, accumulated from the reference time).

usage: make-grib.py OUT MEMBERS STEPS [deterministic] [edition1] [mx2t6+tp]
  MEMBERS  ensemble size (GRIB2 product definition template 4.1, or 4.11 for the period parameters;
           GRIB1 ECMWF local definition 1, marsType pf, number): perturbationNumber 0..MEMBERS-1
  STEPS    comma-separated forecast steps in hours
  deterministic  write template 4.0 (no perturbationNumber) instead; MEMBERS must be 1
  edition1       write GRIB1 (2t only, P1 = step)
  mx2t6+tp       write mx2t6 over (step-6, step] (steps >= 6) and tp accumulated over (0, step] instead of 2t
The fields are smooth plus a deterministic ripple so that every cell, member and step differs; tp never falls.
"""
import math
import subprocess
import sys
import tempfile

out, members, steps = sys.argv[1], int(sys.argv[2]), [int(s) for s in sys.argv[3].split(',')]
flags = set(sys.argv[4:])
deterministic, edition1, periods = 'deterministic' in flags, 'edition1' in flags, 'mx2t6+tp' in flags
NI, NJ = 120, 9


def field(m, step, param):
    vals = []
    for j in range(NJ):
        lat = -3 - 1.5 * j
        for i in range(NI):
            lon = 3 * i
            ripple = 0.01 * ((7 * i + 3 * j + m) % 11)
            if param == 228:  # accumulated metres: a rate that varies in space, member and time, integrated
                vals.append(sum(0.0002 * (1.2 + math.sin(math.radians(lon)) + 0.3 * m + math.cos(k / 5) + ripple)
                                for k in range(step)))
            else:
                vals.append(290 + 5 * math.cos(math.radians(lat)) + 3 * math.sin(math.radians(lon)) + 0.7 * m
                            + 0.05 * step + 2 * math.sin(2 * math.pi * step / 24) + ripple + (1.5 if param == 121 else 0))
    return vals


def message(m, step, param):
    grid = f"""set Ni={NI}; set Nj={NJ};
set latitudeOfFirstGridPointInDegrees=-3; set latitudeOfLastGridPointInDegrees=-15;
set longitudeOfFirstGridPointInDegrees=0; set longitudeOfLastGridPointInDegrees=357;
set iDirectionIncrementInDegrees=3; set jDirectionIncrementInDegrees=1.5;
set bitsPerValue=24;
set values={{{','.join('%.8f' % v for v in field(m, step, param))}}};
write;
"""
    if edition1:
        return (f'set setLocalDefinition=1; set localDefinitionNumber=1; set marsType=11; '
                f'set numberOfForecastsInEnsemble={members}; set number={m};\n'
                f'set dataDate=20261123; set dataTime=0; set paramId={param}; set stepUnits=1; set step={step};\n' + grid)
    if param == 167:
        ensemble = '' if deterministic else (
            f'set productDefinitionTemplateNumber=1; set typeOfProcessedData=4; set typeOfGeneratingProcess=4;\n'
            f'set numberOfForecastsInEnsemble={members}; set perturbationNumber={m};\n')
        when = f'set stepUnits=1; set forecastTime={step};\n'
        level = 'set typeOfFirstFixedSurface=103; set scaleFactorOfFirstFixedSurface=0; set scaledValueOfFirstFixedSurface=2;\n'
    else:  # template 4.11: ensemble member, statistics over a time interval (1 = accumulation, 2 = maximum)
        ensemble = (f'set productDefinitionTemplateNumber=11; set typeOfProcessedData=4; set typeOfGeneratingProcess=4;\n'
                    f'set numberOfForecastsInEnsemble={members}; set perturbationNumber={m};\n')
        start = 0 if param == 228 else step - 6
        when = (f'set typeOfStatisticalProcessing={1 if param == 228 else 2}; set stepUnits=1; '
                f'set startStep={start}; set endStep={step};\n')
        level = ''
    return ensemble + f'set dataDate=20261123; set dataTime=0; set paramId={param};\n' + level + when + grid


params = [121, 228] if periods else [167]
# as ECMWF writes them: no 6-h maximum at step 0 (it would cover no time), tp at step 0 is zero
rules = [message(m, step, p) for m in range(members) for p in params for step in steps if not (p == 121 and step < 6)]
sample = 'regular_ll_sfc_grib1.tmpl' if edition1 else 'regular_ll_sfc_grib2.tmpl'
with tempfile.NamedTemporaryFile('w', suffix='.rules') as f:
    f.write('\n'.join(rules))
    f.flush()
    subprocess.run(['grib_filter', '-o', out, f.name, f'/usr/share/eccodes/samples/{sample}'], check=True)
