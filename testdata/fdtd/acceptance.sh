#!/usr/bin/env bash
# Full-wave acceptance of the demo and every example design: runs
# `stubcraft verify --mesh normal --json` on each (at low priority) and
# records the figures in acceptance.tsv with the command and the date.
# Issue 11's criterion: full-wave best match within 1 % of f0 and |S11| at
# f0 ≤ −20 dB, from the corrected layout as built.
# Usage: testdata/fdtd/acceptance.sh [design ...]   (from the repository root; slow)
#   Designs are demo or names under testdata/designs (default: the demo and
#   every design there but the bad-* inputs);
#   OUT=file writes there instead of acceptance.tsv.
set -euo pipefail
cd "$(dirname "$0")/../.."
mesh=${MESH:-normal}
bin=$(mktemp -d)/stubcraft
go build -o "$bin" ./cmd/stubcraft
out=${OUT:-testdata/fdtd/acceptance.tsv}
tmp=$(mktemp)
{
  echo "# made by: MESH=$mesh testdata/fdtd/acceptance.sh $* ($(git rev-parse --short HEAD)), $(date -u +%Y-%m-%dT%H:%MZ)"
  printf 'design\tf0_hz\tcircuit_s11_db_f0\tcircuit_best_match_hz\tfullwave_s11_db_f0\tfullwave_best_match_hz\tmax_s_difference\tcells\tsteps\tseconds\n'
} > "$tmp"
names=("$@")
if [ ${#names[@]} -eq 0 ]; then
  names=(demo)
  for f in testdata/designs/*.toml; do
    n=$(basename "$f" .toml)
    case "$n" in bad-*) ;; *) names+=("$n") ;; esac
  done
fi
designs=()
for d in "${names[@]}"; do
  if [ "$d" = demo ]; then designs+=(demo); else designs+=("testdata/designs/$d.toml"); fi
done
for d in "${designs[@]}"; do
  dir=$(mktemp -d)/fw
  args=(verify -o "$dir" --mesh "$mesh" --json --accept-mismatch)
  [ "$d" = demo ] || args=(verify "$d" -o "$dir" --mesh "$mesh" --json --accept-mismatch)
  if json=$(nice "$bin" "${args[@]}" 2>"$dir.err"); then
    python3 - "$d" "$json" >> "$tmp" <<'PY'
import json, sys
d, j = sys.argv[1], json.loads(sys.argv[2])
name = d.split('/')[-1].removesuffix('.toml')
print('\t'.join([name, '%.6g' % j['frequency_hz'], '%.2f' % j['circuit_s11_db_f0'], '%.6g' % j['circuit_best_match_hz'],
                 '%.2f' % j['s11_db_f0'], '%.6g' % j['best_match_hz'], '%.4f' % j['max_s_difference'],
                 str(j['cells']), str(j['steps']), '%.0f' % j['seconds']]))
PY
  else
    printf '%s\tfailed: %s\n' "$(basename "$d" .toml)" "$(tr '\n' ' ' < "$dir.err" | cut -c1-200)" >> "$tmp"
  fi
done
mv "$tmp" "$out"
