#!/usr/bin/env bash
# The full-wave records of the width step, the via and the mitred bend
# (issues 11 and 12): simulates each board with physical/fdtd and writes
# step.tsv, via-column.tsv and bend.tsv here, each headed by the command, the
# commit and the date. go test ./physical checks the models against them.
# Usage: testdata/discontinuities/run.sh [Step|ViaColumn|Bend]   (slow; runs at low priority)
#   ViaColumn: the via cases with more and more nodes across the column (via-column.tsv;
#   DIVISIONS=0,1,2,4,8 chooses the drawings)
#   MESH=coarse|normal|fine (default coarse), CASES=0,2 (a subset of the cases)
set -euo pipefail
cd "$(dirname "$0")/../.."
export STUBCRAFT_COMMIT
STUBCRAFT_COMMIT=$(git rev-parse --short HEAD)$(git diff --quiet HEAD -- physical || echo "+dirty")
STUBCRAFT_DISC_RECORD=1 nice go test ./physical/fdtd -run "TestRecord(${1:-Step|ViaColumn|Bend})$" -v -timeout 3h
