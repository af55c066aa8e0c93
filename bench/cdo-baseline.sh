#!/bin/sh
# What a user would script with CDO: one `cdo fldmean -sellonlatbox` per region box and file (all
# variables of the file at once), one output file per box.
#   sh bench/cdo-baseline.sh REGIONS_JSON OUT_DIR FILE [FILE ...]
set -eu
regions_json=$1
out_dir=$2
shift 2
mkdir -p "$out_dir"
# One "id west east south north" line per box (python only parses the JSON list of boxes).
boxes=$(/usr/bin/python3 -c 'import json,sys
for r in json.load(open(sys.argv[1]))["regions"]: print(r["id"], r["west"], r["east"], r["south"], r["north"])' "$regions_json")
n=0
for file in "$@"; do
  n=$((n + 1))
  echo "$boxes" | while read -r id west east south north; do
    cdo -s -O fldmean -sellonlatbox,"$west","$east","$south","$north" "$file" "$out_dir/${n}_${id}.nc"
  done
done
