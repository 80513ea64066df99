#!/usr/bin/env bash
# The T-junction sweep of issue 11 §4: tees over through/stub width ratios
# 0.3–3, εr 2.2–10.2, h 0.2–1.6 mm and f·h 1–5 GHz·mm, each with four open
# stub lengths, simulated with physical/fdtd; the reference-plane shifts d1
# and d2, the factor k on the stub admittance and the node susceptance B
# are extracted per frequency and written to tee.tsv here, headed by the
# command, the commit and the date. go test ./physical checks the model
# (physical/tee.go) against the record.
# Usage: testdata/tee/sweep.sh   (from anywhere; slow, runs at low priority)
#   MESH=normal for the normal mesh (default coarse); ONLY=0,3 runs those
#   geometries only and writes $TMPDIR/tee-partial.tsv instead of the record.
set -euo pipefail
cd "$(dirname "$0")/../.."
STUBCRAFT_TEE_RECORD=1 STUBCRAFT_TEE_MESH="${MESH:-coarse}" STUBCRAFT_TEE_ONLY="${ONLY:-}" \
  STUBCRAFT_TEE_COMMIT="$(git rev-parse --short HEAD)$(git diff --quiet HEAD -- physical/fdtd || echo +edits)" \
  nice go test ./physical/fdtd -run 'TestRecordTee$' -v -timeout 3h
