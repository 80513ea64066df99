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

// creationTime is SOURCE_DATE_EPOCH when set (reproducible builds), else now.
func creationTime() (time.Time, error) {
	if s := os.Getenv("SOURCE_DATE_EPOCH"); s != "" {
		sec, err := strconv.ParseInt(s, 10, 64)
		if err != nil {
			return time.Time{}, fmt.Errorf("SOURCE_DATE_EPOCH = %q: not a whole number of seconds", s)
		}
		return time.Unix(sec, 0).UTC(), nil
	}
	return time.Now().UTC().Truncate(time.Second), nil
}
