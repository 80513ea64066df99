#!/usr/bin/env bash
# The demo's full-wave offset study (issue 11 §5): the demo's drawn copper
# solved on the coarse mesh refined 1, 4/3 (normal), 2 and 8/3 times, and on
# the normal mesh with its edge and substrate cells halved, or its largest
# cell halved; each run's best match, |S11| at f0 and port-line εeff and Z0
# at f0 recorded in offset.tsv with the command and the date; TestRecordedDemoOffset
# (synth/fullwave) holds the record.
# Usage: testdata/fdtd/offset.sh   (from anywhere; slow, runs at low priority)
set -euo pipefail
cd "$(dirname "$0")/../.."
STUBCRAFT_FDTD_RECORD=1 nice go test ./synth/fullwave -run 'TestRecordDemoOffset$' -v -timeout 3h
