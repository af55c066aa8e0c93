/**
 * The catalogue of every diagnostic code: the stage that raises it, its default severity, what it means and
 * how to fix it. `DiagnosticCode` is derived from this table, so a code that is not listed here does not
 * compile. DEVELOPERS.md renders it as a table (`npm run diagnostics-table`; a test fails when it is stale).
 */

export const STAGES = ['config', 'read', 'indicators', 'calibrate', 'decide', 'render', 'deliver', 'ledger', 'schedule', 'cli'] as const;
export type Stage = (typeof STAGES)[number];

/** `error`: this thing could not be done; `warning`: it was done with less (e.g. an input left out); `note`: for information. */
export type Severity = 'error' | 'warning' | 'note';

export interface CodeEntry {
  readonly stage: Stage;
  readonly severity: Severity;
  readonly meaning: string;
  readonly fix: string;
}

export const DIAGNOSTIC_CODES = {
  // config: the operator YAML (always with file:line:column)
  'config-invalid': {
    stage: 'config',
    severity: 'error',
    meaning: 'the configuration has problems (each listed as its own diagnostic)',
    fix: 'fix each listed line; run `forelight check`',
  },
  'config-file': {
    stage: 'config',
    severity: 'error',
    meaning: 'a configuration or included file cannot be read, or is too large',
    fix: 'check the path (relative to the including file) and the size limit',
  },
  'config-yaml': {
    stage: 'config',
    severity: 'error',
    meaning: 'YAML syntax error, duplicate key, custom tag or alias expansion over the limit',
    fix: 'fix the YAML at the position given',
  },
  'config-include': {
    stage: 'config',
    severity: 'error',
    meaning: 'regions or teams missing, or given both inline and by include',
    fix: 'give each list once: inline or through include:',
  },
  'config-schema': {
    stage: 'config',
    severity: 'error',
    meaning: 'a key, type or value does not match config/forelight.schema.json',
    fix: 'follow the message (allowed keys, types and ranges are in the schema)',
  },
  'config-duplicate-id': { stage: 'config', severity: 'error', meaning: 'two entries of a list share an id', fix: 'rename one of them' },
  'config-reference': {
    stage: 'config',
    severity: 'error',
    meaning: 'an id refers to a region, indicator, team, stage or source that does not exist',
    fix: 'use one of the ids listed in the message',
  },
  'config-rule': {
    stage: 'config',
    severity: 'error',
    meaning: 'a trigger rule is inconsistent (stage, tier, leads, probability or cost-loss)',
    fix: 'follow the message; see the trigger-rules comments in config/forelight.yaml',
  },
  'config-text': {
    stage: 'config',
    severity: 'error',
    meaning: 'a text (label, caution, template, phrase) is missing for a locale',
    fix: 'add the text for every locale a team uses',
  },
  'config-value': {
    stage: 'config',
    severity: 'error',
    meaning: 'a value is out of range or inconsistent with another (schedule, paths, thresholds)',
    fix: 'follow the message',
  },
  'config-indicator': {
    stage: 'config',
    severity: 'error',
    meaning: 'an indicator needs a quantity or parameter that is not configured',
    fix: 'map the quantity in the sources, or fix the parameter',
  },
  'config-boundaries': {
    stage: 'config',
    severity: 'error',
    meaning:
      'a boundary file (regions: boundaries:) cannot be read, is not WGS 84 longitude/latitude, or has a feature with an invalid geometry, id or team',
    fix: 'follow the message (it names the file, the feature index and id); repair with ogr2ogr as suggested',
  },
  'config-combine': {
    stage: 'config',
    severity: 'error',
    meaning: 'escalation.combine is inconsistent (groups, matrix size or stages)',
    fix: 'follow the message; see escalation.combine in config/forelight.yaml',
  },
  'grid-not-checked': {
    stage: 'config',
    severity: 'note',
    meaning: "a source's forecast file is missing or unreadable, so `forelight check` could not compare the regions with its grid",
    fix: 'run check again once the files are there',
  },
  'config-pattern': {
    stage: 'config',
    severity: 'error',
    meaning:
      "a forecast-files or hindcast-files pattern has an unknown placeholder, one of a source's forecast-files patterns matches no file while the others do, or hindcast-files matches no file or has no {year} or {date}",
    fix: 'fix the pattern at the line given (placeholders: {date}, {year}, {mmdd}, {var}, {member})',
  },
  'region-between-centres': {
    stage: 'config',
    severity: 'warning',
    meaning:
      'a box region lies on a source grid but contains no cell centre: with cell-rule centre it gets no cells; with overlap (default) its value is that of the cells around it',
    fix: 'remove cell-rule: centre, enlarge the box, or use a finer grid',
  },
  'config-population': {
    stage: 'config',
    severity: 'error',
    meaning:
      'the population raster named by population.file is missing, unreadable, not WGS 84 longitude/latitude, or does not cover a region',
    fix: 'follow the message; reproject with gdalwarp -t_srs EPSG:4326 where it says so',
  },
  'config-grid': {
    stage: 'config',
    severity: 'error',
    meaning: 'a region lies entirely outside the grid of a source',
    fix: 'check the region coordinates or the source files',
  },
  // read: forecast, hindcast and observation files
  'input-missing': {
    stage: 'read',
    severity: 'error',
    meaning: 'an input file cannot be opened',
    fix: 'check the path pattern and that the file arrived',
  },
  'input-format': {
    stage: 'read',
    severity: 'error',
    meaning: 'the file is neither NetCDF (classic or NetCDF-4) nor GRIB',
    fix: 'check the source path; unpack a gzip or zip download first (the message gives the command); download an empty or text file again',
  },
  'input-truncated': {
    stage: 'read',
    severity: 'error',
    meaning: 'the file is shorter than its header says',
    fix: 'download or copy the file again',
  },
  'input-corrupt': {
    stage: 'read',
    severity: 'error',
    meaning: 'the file header or metadata is malformed',
    fix: 'download the file again; check it with `ncdump -h`',
  },
  'input-type': {
    stage: 'read',
    severity: 'error',
    meaning: 'a variable is not numeric',
    fix: 'choose a numeric variable in the source config',
  },
  'input-changed': {
    stage: 'read',
    severity: 'error',
    meaning: 'the file changed while it was being read',
    fix: 'run again once the file is complete',
  },
  'input-hdf5': {
    stage: 'read',
    severity: 'error',
    meaning: 'the HDF5 library could not read a variable',
    fix: 'check the file with `ncdump`; download it again',
  },
  'input-filter': {
    stage: 'read',
    severity: 'error',
    meaning: 'a variable is compressed with an HDF5 filter this reader cannot decode',
    fix: 're-compress the file with deflate (`nccopy -d1`)',
  },
  'eccodes-missing': {
    stage: 'read',
    severity: 'error',
    meaning: "a GRIB file needs ecCodes' command-line tools, which are not installed",
    fix: 'install the Debian package libeccodes-tools',
  },
  'grib-unreadable': {
    stage: 'read',
    severity: 'error',
    meaning: 'ecCodes could not convert a GRIB file',
    fix: 'check that the download is complete (grib_ls) or fetch the file again',
  },
  'grib-empty': {
    stage: 'read',
    severity: 'error',
    meaning: 'a GRIB file holds no message',
    fix: 'check that the download is complete (grib_ls)',
  },
  'members-differ': {
    stage: 'read',
    severity: 'error',
    meaning: 'the member files of one forecast differ in grid, times or variables',
    fix: 'give every member file the same grid, times and variables',
  },
  'input-variable': {
    stage: 'read',
    severity: 'error',
    meaning: 'a variable asked for is not in the file',
    fix: 'use one of the variables listed in the message',
  },
  'read-failed': {
    stage: 'read',
    severity: 'error',
    meaning: 'a file could not be read for an unexpected reason',
    fix: 'check the file; the other sources went on',
  },
  'read-selection': {
    stage: 'read',
    severity: 'error',
    meaning: 'a hyperslab does not fit the variable (internal selection error)',
    fix: 'report it with the file',
  },
  'read-worker': {
    stage: 'read',
    severity: 'error',
    meaning: 'a reader thread failed',
    fix: 'run again; lower FORELIGHT_READ_THREADS if it repeats',
  },
  'read-threads': {
    stage: 'read',
    severity: 'error',
    meaning: 'FORELIGHT_READ_THREADS is not a whole number of at least 1',
    fix: 'set it to a whole number, or unset it',
  },
  'grid-unsupported': {
    stage: 'read',
    severity: 'error',
    meaning: 'the grid is curvilinear (2-D latitude/longitude)',
    fix: 'regrid to a regular latitude-longitude grid (e.g. `cdo remapbil,r360x180 in.nc regular.nc` for 1°)',
  },
  'no-coordinate': {
    stage: 'read',
    severity: 'error',
    meaning: 'no latitude or longitude coordinate found by CF attributes',
    fix: 'add standard_name or units attributes to the coordinates',
  },
  'variable-missing': {
    stage: 'read',
    severity: 'error',
    meaning: 'the variable mapped to a quantity is not in the file',
    fix: 'map the quantity to one of the variables listed',
  },
  'variable-not-gridded': {
    stage: 'read',
    severity: 'error',
    meaning: 'the variable lacks latitude or longitude dimensions',
    fix: 'map the quantity to a gridded variable',
  },
  'variable-extra-dimension': {
    stage: 'read',
    severity: 'error',
    meaning: 'the variable has a dimension Forelight cannot reduce',
    fix: 'select one level first (e.g. `ncks -d level,0`)',
  },
  'time-order': {
    stage: 'read',
    severity: 'error',
    meaning: 'the time or lead axis is not strictly increasing (CF 1.11 §5: coordinate values are strictly monotonic)',
    fix: 'sort the steps (`cdo sorttimestamp in.nc out.nc` for an absolute time axis) or ask the provider for the file again',
  },
  'time-overlap': {
    stage: 'read',
    severity: 'error',
    meaning: 'cell_methods gives periods longer than the spacing of the steps (overlapping running periods)',
    fix: 'keep every n-th step (ncks -d) or add time_bnds',
  },
  'accumulation-decrease': {
    stage: 'read',
    severity: 'error',
    meaning: 'a variable read as accumulated since the start decreases from one step to the next',
    fix: 'if it holds per-step totals say so in cell_methods ("time: sum"); otherwise replace the file',
  },
  'time-missing': {
    stage: 'read',
    severity: 'error',
    meaning: 'the variable has no time axis',
    fix: 'map the quantity to a variable with a time dimension',
  },
  'time-units': {
    stage: 'read',
    severity: 'error',
    meaning: 'time or lead-time units cannot be decoded (CF "<unit> since <date>")',
    fix: 'fix the units attribute of the time variable',
  },
  'months-gap': {
    stage: 'read',
    severity: 'error',
    meaning: 'a file of monthly values skips a month',
    fix: 'provide consecutive monthly values',
  },
  'monthly-values': {
    stage: 'read',
    severity: 'error',
    meaning: 'a file of monthly values is mapped to a source of the days or weeks tier',
    fix: "set 'tier: months' for the source",
  },
  'reference-several': {
    stage: 'read',
    severity: 'error',
    meaning: 'a forecast file (or a file read without a start index) holds several forecast reference times',
    fix: 'split the file per forecast start (ncks -d <dimension>,K,K per start K) and name the parts with {date}; hindcast-files reads such a file as it is',
  },
  'reference-invalid': {
    stage: 'read',
    severity: 'error',
    meaning: 'the requested reference time is not an ISO date',
    fix: 'pass YYYY-MM-DD or an ISO 8601 instant',
  },
  'hindcast-start-index': {
    stage: 'read',
    severity: 'error',
    meaning: 'a file of several hindcast starts no longer holds the start listed for the run (it changed after it was listed)',
    fix: 'run again once the download has finished; replace a truncated file',
  },
  'hindcast-starts-variable': {
    stage: 'read',
    severity: 'error',
    meaning: "a variable of a file of several hindcast starts lacks the starts' reference-time dimension",
    fix: 'give the variable one slice per start (ncecat -u <dimension> over the per-start files), or provide one file per start',
  },
  'hindcast-starts-invalid': {
    stage: 'read',
    severity: 'error',
    meaning: 'the forecast reference times of a file of several starts are not usable as starts (two on one day)',
    fix: 'replace the file, or provide one file per start named with {date}',
  },
  'hindcast-start-unknown': {
    stage: 'read',
    severity: 'error',
    meaning: 'hindcast-files gives {year} without {mmdd} and the file states no forecast reference time, so its start is unknown',
    fix: 'put {mmdd} or {date} in hindcast-files, or add a forecast_reference_time variable to the file',
  },
  'hindcast-start-mismatch': {
    stage: 'read',
    severity: 'error',
    meaning: "a hindcast file's own reference time contradicts its path's {year}, or lies outside the forecast's calibration window",
    fix: "rename the file or correct hindcast-files; point it at hindcasts started near the forecast's day of year",
  },
  'reference-mismatch': {
    stage: 'read',
    severity: 'error',
    meaning: "the file's forecast reference time differs from the date in its name",
    fix: 'check the file naming or the source path pattern',
  },
  'input-folder': {
    stage: 'read',
    severity: 'error',
    meaning: 'a folder stands where a forecast file is expected',
    fix: 'point the source at a file; remove a folder a download created by mistake',
  },
  'forecast-unusable': {
    stage: 'read',
    severity: 'warning',
    meaning:
      'a forecast file cannot stand for its source (unreadable, a variable unreadable for every region, no value, or another grid than the hindcasts); an older one is tried',
    fix: 'replace the file; the bulletin says which older forecast it is based on',
  },
  'forecast-fallback': {
    stage: 'read',
    severity: 'warning',
    meaning: 'an older forecast is used because the newer ones were unusable',
    fix: 'replace the damaged newer file(s)',
  },
  'forecast-grid': {
    stage: 'read',
    severity: 'warning',
    meaning: 'a region covers other grid cells in the forecast than in the hindcasts; its part of that tier is held',
    fix: 'give forecasts and hindcasts of a source on one grid',
  },
  'region-empty': {
    stage: 'read',
    severity: 'error',
    meaning: 'a region contains no grid cell centre of the file',
    fix: 'enlarge the region or use a finer grid',
  },
  'population-raster': {
    stage: 'read',
    severity: 'error',
    meaning:
      'the population raster cannot be read or converted (file missing, GDAL missing, no people variable on a latitude-longitude grid)',
    fix: 'check population.file and population.variable in the YAML; GeoTIFF needs the Debian package gdal-bin',
  },
  'population-crs': {
    stage: 'read',
    severity: 'error',
    meaning: 'the population raster is not on a WGS 84 longitude/latitude grid',
    fix: 'reproject it once: gdalwarp -t_srs EPSG:4326 IN.tif OUT.tif',
  },
  'population-coverage': {
    stage: 'read',
    severity: 'error',
    meaning: 'the population raster does not cover a region that an indicator weights by population',
    fix: 'give a raster that covers every region, or weight that indicator by area',
  },
  'population-empty': {
    stage: 'read',
    severity: 'error',
    meaning: 'the population raster holds nobody in a region (all zero or missing), so a population-weighted value has no meaning there',
    fix: 'check the raster over that region (gdalinfo -stats), or weight that indicator by area',
  },
  'region-all-missing': {
    stage: 'read',
    severity: 'error',
    meaning: 'every value of a region is missing (fill values)',
    fix: "check the file's coverage and _FillValue",
  },
  'forecast-missing': {
    stage: 'read',
    severity: 'warning',
    meaning: 'no forecast of a source on or before the issue date',
    fix: 'check that the files arrived and the path pattern in sources[].forecast-files',
  },
  'hindcast-grid': {
    stage: 'read',
    severity: 'warning',
    meaning: 'a hindcast is on another grid than the forecast; left out for that region',
    fix: "provide hindcasts on the forecast's grid",
  },
  'no-forecast-read': {
    stage: 'read',
    severity: 'error',
    meaning: 'no forecast of any source could be read; nothing was issued',
    fix: 'fix the files named and run again',
  },
  unit: {
    stage: 'read',
    severity: 'error',
    meaning: 'a unit is missing, unknown or cannot be converted',
    fix: "fix the units attribute, or write the threshold in the indicator's units",
  },
  // indicators
  'series-shape': {
    stage: 'indicators',
    severity: 'error',
    meaning: 'an input series has an inconsistent shape',
    fix: 'report it with the file',
  },
  'impossible-value': {
    stage: 'indicators',
    severity: 'error',
    meaning: 'an input value lies outside the physically possible range',
    fix: 'check the variable mapping, its units and scale_factor/add_offset',
  },
  misaligned: {
    stage: 'indicators',
    severity: 'error',
    meaning: 'two quantities of a region cover different days or members',
    fix: 'give both quantities on the same days and members',
  },
  'missing-quantity': {
    stage: 'indicators',
    severity: 'error',
    meaning: 'an indicator needs a quantity the source does not provide',
    fix: 'map the quantity in sources[].variables',
  },
  'missing-climatology': {
    stage: 'indicators',
    severity: 'error',
    meaning: 'an indicator needs a climatology that neither observations nor params give',
    fix: 'configure observations or give the climatology in params',
  },
  'bad-param': {
    stage: 'indicators',
    severity: 'error',
    meaning: 'an indicator parameter is invalid',
    fix: 'fix params of the indicator in the YAML',
  },
  'indicator-skipped': {
    stage: 'indicators',
    severity: 'warning',
    meaning: 'one region × indicator of a forecast was left out (the reason follows)',
    fix: 'fix the cause given; the others were issued',
  },
  'observations-skipped': {
    stage: 'indicators',
    severity: 'warning',
    meaning: 'the indicator could not be computed on the observations of a region',
    fix: 'fix the cause given; skill falls back to the perfect-model estimate',
  },
  // calibrate
  'hindcast-skipped': {
    stage: 'calibrate',
    severity: 'warning',
    meaning: 'hindcast files of a region could not be used (the reason follows)',
    fix: 'fix the cause given; the other years still calibrate',
  },
  'hindcast-members': {
    stage: 'calibrate',
    severity: 'warning',
    meaning: 'a hindcast year has another ensemble size than the first; left out',
    fix: 'regenerate it with the same ensemble',
  },
  'hindcast-none': { stage: 'calibrate', severity: 'warning', meaning: 'no hindcast year was usable', fix: 'provide hindcast files' },
  'climate-mixed-months': {
    stage: 'calibrate',
    severity: 'warning',
    meaning:
      "hindcast starts of the months tier begin their month leads in other calendar months than the forecast and too few share the forecast's; every start is pooled, mixing months",
    fix: 'provide hindcast starts on the same day of the month as the forecast, or narrow calibration.window-days',
  },
  'lead-date': { stage: 'calibrate', severity: 'error', meaning: 'a local day is not YYYY-MM-DD (internal)', fix: 'report it' },
  'lead-days-gap': {
    stage: 'calibrate',
    severity: 'error',
    meaning: 'the forecast days are not consecutive',
    fix: 'provide daily data without gaps',
  },
  'verify-shape': {
    stage: 'calibrate',
    severity: 'error',
    meaning: 'forecasts and outcomes differ in number (internal)',
    fix: 'report it',
  },
  'percentile-range': {
    stage: 'calibrate',
    severity: 'error',
    meaning: 'a percentile is outside 0..100',
    fix: 'give a percentile between 0 and 100',
  },
  'checksum-read': {
    stage: 'calibrate',
    severity: 'error',
    meaning: 'a file cannot be read to checksum it',
    fix: 'check that the file exists and is readable',
  },
  // decide
  'bad-stage-history': {
    stage: 'decide',
    severity: 'error',
    meaning: 'the stored stage history is unusable',
    fix: 'inspect the ledger; a run with --force starts a fresh history',
  },
  // render
  template: {
    stage: 'render',
    severity: 'error',
    meaning: 'a template or phrase failed to render',
    fix: 'fix the template named (undefined variables stop rendering)',
  },
  catalogue: {
    stage: 'render',
    severity: 'error',
    meaning: 'a message catalogue (messages/<locale>.yaml) is not valid YAML or not a mapping of keys to texts',
    fix: 'fix the file named; one "key: text" per line',
  },
  'no-catalogue': {
    stage: 'render',
    severity: 'error',
    meaning: "no message catalogue for a team's locale",
    fix: 'copy templates/messages/en.yaml to messages/<locale>.yaml and translate it',
  },
  'missing-message': {
    stage: 'render',
    severity: 'error',
    meaning: "a message key is missing from a locale's catalogue",
    fix: 'add the key to messages/<locale>.yaml',
  },
  'bad-message': {
    stage: 'render',
    severity: 'error',
    meaning: 'a catalogue message is not valid ICU MessageFormat',
    fix: 'fix its braces, plural and select cases',
  },
  'missing-translation': {
    stage: 'render',
    severity: 'error',
    meaning: "a text has no translation for a team's locale",
    fix: 'add the text for that locale',
  },
  'pdf-unavailable': {
    stage: 'render',
    severity: 'note',
    meaning: 'the Chromium named by delivery.pdf-chromium is missing or does not start, so bulletins go out without their PDF',
    fix: 'install the Debian package chromium, or set pdf-chromium: null',
  },
  'unknown-stage': {
    stage: 'render',
    severity: 'error',
    meaning: 'a stage id is not in the configured ladder',
    fix: 'check stage-ladder and the stored history',
  },
  'no-probability-words': {
    stage: 'render',
    severity: 'error',
    meaning: 'probability-words is empty',
    fix: 'add probability-words to the YAML',
  },
  'no-cautions': { stage: 'render', severity: 'error', meaning: 'no caution text for a locale', fix: 'add cautions for that locale' },
  'bad-recipient': {
    stage: 'render',
    severity: 'error',
    meaning: 'a team recipient is not an e-mail address',
    fix: 'fix the address in teams[].recipients',
  },
  'archive-entry': {
    stage: 'render',
    severity: 'error',
    meaning: 'an archive entry is unreadable',
    fix: 'delete or restore the file named; the archive is rebuilt from the others',
  },
  'bulletin-contradiction': {
    stage: 'render',
    severity: 'error',
    meaning:
      'two statements of a rendered bulletin disagree (stage and the rows that drove it, probability word and number, skill wording and figures, threshold text and value, "no forecast available" and the rows); the bulletin went out as rendered',
    fix: 'report it with run.json of the run: it is a bug in Forelight, and the message names region, hazard, range and what disagrees',
  },
  'write-failed': {
    stage: 'render',
    severity: 'error',
    meaning: 'an output file (archive, status, cache, outbox) cannot be written: disk full, read-only or not permitted',
    fix: 'follow the fix named for the errno (free space, remount read-write, permissions)',
  },
  // deliver
  'delivery-temporary': {
    stage: 'deliver',
    severity: 'warning',
    meaning: 'a delivery failed and will be retried',
    fix: 'check the SMTP server; the retry is automatic',
  },
  'delivery-permanent': {
    stage: 'deliver',
    severity: 'error',
    meaning: 'a delivery failed and will not be retried',
    fix: 'fix the address or SMTP settings named',
  },
  // ledger
  'ledger-open': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'the ledger file cannot be opened',
    fix: 'check that its folder exists and is writable, or change config "ledger"',
  },
  'ledger-postgres': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'the PostgreSQL ledger refused a statement, or did not answer',
    fix: 'check the server, the ledger URL and the password variable named by ledger-password-env',
  },
  'ledger-password-missing': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'the variable named by ledger-password-env is not set',
    fix: 'export it with the PostgreSQL password, or remove ledger-password-env',
  },
  'ledger-newer': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'the ledger was written by a newer Forelight',
    fix: 'upgrade Forelight or point config "ledger" at another file',
  },
  'ledger-dry-run': {
    stage: 'ledger',
    severity: 'error',
    meaning: '`run --dry-run` rehearses on an in-memory copy of a SQLite ledger and cannot copy a PostgreSQL one',
    fix: 'use `forelight diff` to see which stages would change without writing anything',
  },
  'ledger-write': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'the ledger cannot be written (disk full, read-only, I/O error); nothing is sent without it',
    fix: 'follow the fix named; the next run resumes this one',
  },
  'run-unknown': { stage: 'ledger', severity: 'error', meaning: 'a run id is not in the ledger', fix: 'list runs with `forelight status`' },
  'run-in-progress': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'another live process is issuing the same forecast',
    fix: 'wait for it to finish or stop that process',
  },
  'bulletin-unknown': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'a bulletin row is not in the ledger',
    fix: 'list bulletins of the run',
  },
  'ledger-row': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'a ledger row does not have the expected shape',
    fix: 'inspect the ledger; it may have been edited by hand or written by another program',
  },
  'stage-history-json': {
    stage: 'ledger',
    severity: 'error',
    meaning: 'a stored stage history is not JSON',
    fix: 'inspect the ledger; a run with --force starts a fresh history',
  },
  // schedule
  'lock-create': {
    stage: 'schedule',
    severity: 'error',
    meaning: 'the lock file cannot be created',
    fix: 'check that the ledger folder is writable',
  },
  'status-read': { stage: 'schedule', severity: 'error', meaning: 'the service status file cannot be read', fix: 'check its permissions' },
  'status-corrupt': {
    stage: 'schedule',
    severity: 'error',
    meaning: 'the service status file is not valid',
    fix: 'delete it; the service writes a new one',
  },
  // cli
  // cluster
  'cluster-job-invalid': {
    stage: 'read',
    severity: 'error',
    meaning: 'a cluster worker was sent a job it cannot use (another kind, or damaged data)',
    fix: 'run the same Forelight release on the coordinator and every worker',
  },
  'cluster-url': { stage: 'cli', severity: 'error', meaning: '--cluster is not a redis:// URL', fix: 'write it as redis://HOST:PORT' },
  'cluster-unreachable': {
    stage: 'cli',
    severity: 'error',
    meaning: "the cluster's Redis cannot be reached",
    fix: 'start redis-server there, or check --cluster',
  },
  usage: { stage: 'cli', severity: 'error', meaning: 'the command line is wrong', fix: 'run `forelight --help`' },
} as const satisfies Record<string, CodeEntry>;

export type DiagnosticCode = keyof typeof DIAGNOSTIC_CODES;

export function isDiagnosticCode(value: unknown): value is DiagnosticCode {
  return typeof value === 'string' && Object.hasOwn(DIAGNOSTIC_CODES, value);
}
