#!/usr/bin/env bash
# The long full-wave validations of physical/fdtd (issue 11): the full
# uniform-line set (a), the mesh convergence (b) and the published patch (e).
# They write lines.tsv, convergence.tsv and patch.tsv here, each headed by
# the command and the date; go test ./physical/fdtd checks the records.
# ONLY=Lines (or Convergence, Patch) runs one of them. ONLY=MaskedLines runs
# the solder-mask check (masked lines against the 2-D field solver, coarse
# and normal mesh) into mask.tsv, and ONLY=CoplanarLines gcpw-probe's
# thick-copper line with the edge cell refined across its gap (normal
# mesh) into coplanar.tsv; they are not in the default set.
# Usage: testdata/fdtd/validate.sh   (from anywhere; slow, runs at low priority)
set -euo pipefail
cd "$(dirname "$0")/../.."
STUBCRAFT_FDTD_RECORD=1 nice go test ./physical/fdtd -run "TestRecord(${ONLY:-Convergence|Lines|Patch})$" -v -timeout 3h
