#!/usr/bin/env bash
# The via fence in the full-wave solver: runs `stubcraft verify --json` on
# testdata/designs/edge-launch-fence.toml (edge-launch landings at both
# ports, a fence along the lines) and on the same design without its
# fence (the fence_pitch line left out), and records both full-wave
# networks (fullwave.s2p) side by side in fence.tsv with the command and
# the date. TestRecordedFence (synth/fullwave) reads it.
# Usage: testdata/fdtd/fence.sh   (from the repository root; slow, low priority)
#   MESH=coarse|normal|fine (default coarse)
set -euo pipefail
cd "$(dirname "$0")/../.."
mesh=${MESH:-coarse}
commit=$(git rev-parse --short HEAD)$(git diff --quiet HEAD -- physical synth cmd || echo "+dirty")
started=$(date -u +%Y-%m-%dT%H:%MZ)
work=$(mktemp -d)
bin=$work/stubcraft
go build -o "$bin" ./cmd/stubcraft
design=testdata/designs/edge-launch-fence.toml
# The copy lives in the work directory: the design names its stackup by
# preset, so nothing resolves relative to it.
bare=$work/edge-launch-nofence.toml
grep -v '^fence_pitch' "$design" > "$bare"
if cmp -s "$design" "$bare"; then echo "fence.sh: $design has no fence_pitch line" >&2; exit 1; fi
for d in fence:$design bare:$bare; do
  nice "$bin" verify "${d#*:}" -o "$work/${d%%:*}" --mesh "$mesh" --json --accept-mismatch > "$work/${d%%:*}.json"
done
python3 - "$work" "$mesh" "$commit" "$started" > testdata/fdtd/fence.tsv <<'PY'
import json, sys
work, mesh, commit, date = sys.argv[1:5]
def s2p(path):
    rows = []
    for line in open(path):
        if line.startswith(('!', '#')) or not line.strip():
            continue
        v = [float(x) for x in line.split()]
        rows.append((v[0], complex(v[1], v[2]), complex(v[3], v[4])))  # f, S11, S21
    return rows
fence, bare = s2p(work + '/fence/fullwave.s2p'), s2p(work + '/bare/fullwave.s2p')
jf, jb = json.load(open(work + '/fence.json')), json.load(open(work + '/bare.json'))
print('# made by: MESH=%s testdata/fdtd/fence.sh (%s), %s' % (mesh, commit, date))
print('# with fence: %d cells, %d steps, %.0f s, best match %.6g Hz, |S11| at f0 %.2f dB; without: %d cells, %d steps, %.0f s, best match %.6g Hz, |S11| at f0 %.2f dB'
      % (jf['cells'], jf['steps'], jf['seconds'], jf['best_match_hz'], jf['s11_db_f0'],
         jb['cells'], jb['steps'], jb['seconds'], jb['best_match_hz'], jb['s11_db_f0']))
print('# f0_hz\t%.6g' % jf['frequency_hz'])
print('f_hz\ts11_fence_re\ts11_fence_im\ts21_fence_re\ts21_fence_im\ts11_bare_re\ts11_bare_im\ts21_bare_re\ts21_bare_im')
for (f, a11, a21), (g, b11, b21) in zip(fence, bare):
    assert abs(f - g) < 1e-3 * f
    print('%.6g\t%.6f\t%.6f\t%.6f\t%.6f\t%.6f\t%.6f\t%.6f\t%.6f' % (f, a11.real, a11.imag, a21.real, a21.imag, b11.real, b11.imag, b21.real, b21.imag))
PY
rm -rf "$work"
