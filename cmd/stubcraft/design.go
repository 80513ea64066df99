package main

import (
	"fmt"
	"os"
	"strconv"
	"time"

	"stubcraft/stackups"
	"stubcraft/synth"
)

// loadDesign loads the design at path, or the embedded demo when path is
// empty, with the stackup and load it refers to. stackupOverride, when
// set, replaces the design's stackup.
func loadDesign(path, stackupOverride string) (synth.BuildInput, error) {
	var opt synth.LoadOptions
	if stackupOverride != "" {
		st, err := stackups.Load(stackupOverride)
		if err != nil {
			return synth.BuildInput{}, fmt.Errorf("--stackup %q: %w", stackupOverride, err)
		}
		opt.Stackup = &st
	}
	if path == "" {
		return synth.LoadDemo(opt)
	}
	return synth.LoadDesign(path, opt)
}

// The range of SOURCE_DATE_EPOCH, s since 1970-01-01 UTC: from
// 1980-01-01, the first day a ZIP archive's (DOS) date can hold, to
// 9999-12-31 23:59:59, the last that the four-digit year fields of the
// artefacts (Gerber X2 CreationDate, the job file, PDF) can hold.
const (
	minSourceDateEpoch = 315532800
	maxSourceDateEpoch = 253402300799
)

// creationTime is SOURCE_DATE_EPOCH when set (reproducible builds), else now.
func creationTime() (time.Time, error) {
	if s := os.Getenv("SOURCE_DATE_EPOCH"); s != "" {
		sec, err := strconv.ParseInt(s, 10, 64)
		if err != nil {
			return time.Time{}, fmt.Errorf("SOURCE_DATE_EPOCH = %q: not a whole number of seconds", s)
		}
		if sec < minSourceDateEpoch || sec > maxSourceDateEpoch {
			return time.Time{}, fmt.Errorf("SOURCE_DATE_EPOCH = %q: outside the years 1980–9999 (%d to %d seconds since 1970-01-01 UTC)",
				s, minSourceDateEpoch, maxSourceDateEpoch)
		}
		return time.Unix(sec, 0).UTC(), nil
	}
	return time.Now().UTC().Truncate(time.Second), nil
}
