#!/usr/bin/env bash
# The long full-wave validations of physical/fdtd (issue 11): the full
# uniform-line set (a) and the mesh convergence (b). They write lines.tsv
# and convergence.tsv here, each headed by the command and the date;
# go test ./physical/fdtd checks the records.
# Usage: testdata/fdtd/validate.sh   (from anywhere; slow, runs at low priority)
set -euo pipefail
cd "$(dirname "$0")/../.."
STUBCRAFT_FDTD_RECORD=1 nice go test ./physical/fdtd -run "TestRecord(${ONLY:-Convergence|Lines})$" -v -timeout 3h
