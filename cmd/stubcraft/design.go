package main

import (
	"bytes"
	"embed"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"time"

	"stubcraft/physical"
	"stubcraft/stackups"
	"stubcraft/synth"
)

//go:embed demo/*.toml
var demoFS embed.FS

// demoDesign is the design built when no file is given.
const demoDesign = "demo/soil-probe.toml"

// loadDesign decodes the design at path, or the embedded demo when path is
// empty, and reads the stackup and load it refers to. stackupOverride, when
// set, replaces the design's stackup.
func loadDesign(path, stackupOverride string) (synth.Design, stackups.Stackup, synth.Load, error) {
	var (
		data []byte
		err  error
		dir  string
		name = path
	)
	if path == "" {
		data, err = demoFS.ReadFile(demoDesign)
		name = "(demo) " + filepath.Base(demoDesign)
	} else {
		data, err = os.ReadFile(path)
		dir = filepath.Dir(path)
	}
	if err != nil {
		return synth.Design{}, stackups.Stackup{}, nil, err
	}
	d, err := synth.DecodeDesign(bytes.NewReader(data), name, dir)
	if err != nil {
		return synth.Design{}, stackups.Stackup{}, nil, err
	}
	ref := d.StackupRef()
	if stackupOverride != "" {
		ref = stackupOverride
	}
	st, err := stackups.Load(ref)
	if err != nil {
		if stackupOverride != "" {
			return synth.Design{}, stackups.Stackup{}, nil, fmt.Errorf("--stackup %q: %w", stackupOverride, err)
		}
		return synth.Design{}, stackups.Stackup{}, nil, d.KeyError("stackup", err)
	}
	load, err := openLoad(d)
	if err != nil {
		return synth.Design{}, stackups.Stackup{}, nil, d.KeyError("load.touchstone", err)
	}
	return d, st, load, nil
}

// openLoad returns the design's load: a constant or a Touchstone file.
func openLoad(d synth.Design) (synth.Load, error) {
	if d.Load.Touchstone == "" {
		return synth.ConstantLoad(d.Load.Impedance), nil
	}
	path := d.Load.Touchstone
	ports, err := physical.TouchstonePorts(path)
	if err != nil {
		return nil, err
	}
	if ports != 1 {
		return nil, fmt.Errorf("%s: a load is a one-port (.s1p) file", path)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	t, err := physical.ReadTouchstone(f, path, 1)
	if err != nil {
		return nil, err
	}
	return synth.TouchstoneLoad{File: t, Path: path}, nil
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
