#!/usr/bin/env bash
# Full-wave centring of the demo and example designs: runs
# `stubcraft build --fullwave-centre --mesh $MESH --json --no-tolerance` on
# each (at low priority) and records every full-wave run of the centring in
# centre.tsv with the command and the date. Issue 11 §6: the full-wave best
# match within 0.3 % of f0 after at most three full-wave runs.
# TestRecordedCentring (synth/fullwave) checks the record.
# Usage: testdata/fdtd/centre.sh [design.toml|demo ...]   (from the repository root; slow)
# With APPEND=1 the runs are added to the record under their own "# made by:"
# line instead of replacing it; OUT=FILE writes FILE instead of centre.tsv.
set -euo pipefail
cd "$(dirname "$0")/../.."
mesh=${MESH:-normal}
bin=$(mktemp -d)/stubcraft
go build -o "$bin" ./cmd/stubcraft
out=${OUT:-testdata/fdtd/centre.tsv}
tmp=$(mktemp)
if [ "${APPEND:-}" = 1 ] && [ -f "$out" ]; then cp "$out" "$tmp"; fi
{
  echo "# made by: MESH=$mesh testdata/fdtd/centre.sh $* ($(git rev-parse --short HEAD)), $(date -u +%Y-%m-%dT%H:%MZ)"
  printf 'design\tmesh\tf0_hz\trun\tbest_match_hz\tbest_match_offset_pct\ts11_db_f0\tcircuit_best_match_hz\tmax_s_difference\tfit_rms_before\tfit_rms_after\tcells\tsteps\tconverged\tkept_run\n'
} >> "$tmp"
designs=("$@")
[ ${#designs[@]} -gt 0 ] || designs=(demo testdata/designs/compact-bent-stub.toml testdata/designs/double-stub-sections.toml)
for d in "${designs[@]}"; do
  dir=$(mktemp -d)/out
  args=(build -o "$dir" --fullwave-centre --mesh "$mesh" --json --no-tolerance)
  [ "$d" = demo ] || args=(build "$d" -o "$dir" --fullwave-centre --mesh "$mesh" --json --no-tolerance)
  if json=$(nice "$bin" "${args[@]}" 2>"$dir.err"); then
    python3 - "$d" "$json" >> "$tmp" <<'PY'
import json, sys
d, j = sys.argv[1], json.loads(sys.argv[2])
name = d.split('/')[-1].removesuffix('.toml')
c = j['fullwave_centre']
fit = lambda r, k: '%.4f' % r[k] if k in r else '-'  # no fit after the last run
for r in c['runs']:
    print('\t'.join([name, c['mesh'], '%.6g' % j['frequency_hz'], str(r['run']), '%.7g' % r['best_match_hz'],
                     '%.3f' % r['best_match_offset_pct'], '%.2f' % r['s11_db_f0'], '%.7g' % r['circuit_best_match_hz'],
                     '%.4f' % r['max_s_difference'],
                     fit(r, 'fit_rms_s_difference_before'), fit(r, 'fit_rms_s_difference_after'),
                     str(r['cells']), str(r['steps']), str(c['converged']).lower(), str(c['kept_run'])]))
PY
  else
    printf '%s\tfailed: %s\n' "$(basename "$d" .toml)" "$(tr '\n' ' ' < "$dir.err" | cut -c1-200)" >> "$tmp"
  fi
done
mv "$tmp" "$out"
