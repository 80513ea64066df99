package synth

import (
	"bytes"
	_ "embed"
	"io"
	"path/filepath"

	"stubcraft/physical"
	"stubcraft/physical/inputfile"
	"stubcraft/stackups"
)

// demoTOML is the embedded demo design, built when no file is given.
//
//go:embed demo/soil-probe.toml
var demoTOML []byte

// DemoSource is the name the demo design goes by in messages.
const DemoSource = "(demo) soil-probe.toml"

// DemoTOML returns the text of the embedded demo design.
func DemoTOML() []byte { return bytes.Clone(demoTOML) }

// LoadOptions change how a design is loaded.
type LoadOptions struct {
	// Stackup, when not nil, replaces the stackup the design names (which
	// is then not read).
	Stackup *stackups.Stackup
}

// LoadDesign reads the design file at path and the stackup and load it
// refers to; relative paths in it start from the file's directory. Errors
// in the design, and in the files it names, are *DesignError.
func LoadDesign(path string, opt LoadOptions) (BuildInput, error) {
	data, err := inputfile.Read(path, inputfile.TOMLLimit)
	if err != nil {
		return BuildInput{}, err
	}
	return ReadDesign(bytes.NewReader(data), path, filepath.Dir(path), opt)
}

// LoadDemo returns the embedded demo design, ready to build.
func LoadDemo(opt LoadOptions) (BuildInput, error) {
	return ReadDesign(bytes.NewReader(demoTOML), DemoSource, "", opt)
}

// ReadDesign decodes a design from r (source names it in messages; dir is
// where its relative paths start, "" for the working directory) and reads
// the stackup and load it refers to.
func ReadDesign(r io.Reader, source, dir string, opt LoadOptions) (BuildInput, error) {
	d, err := DecodeDesign(r, source, dir)
	if err != nil {
		return BuildInput{}, err
	}
	var st stackups.Stackup
	if opt.Stackup != nil {
		st = *opt.Stackup
	} else if st, err = stackups.Load(d.StackupRef()); err != nil {
		return BuildInput{}, d.KeyError("stackup", err)
	}
	load, err := OpenLoad(d)
	if err != nil {
		return BuildInput{}, d.KeyError("load.touchstone", err)
	}
	return BuildInput{Design: d, Stackup: st, Load: load}, nil
}

// OpenLoad returns the design's load: a constant impedance, or the
// one-port Touchstone file it names (resolved against the design's
// directory when it was decoded).
func OpenLoad(d Design) (Load, error) {
	if d.Load.Touchstone == "" {
		return ConstantLoad(d.Load.Impedance), nil
	}
	path := d.Load.Touchstone
	t, err := physical.ReadTouchstoneFile(path, 1)
	if err != nil {
		return nil, err
	}
	return TouchstoneLoad{File: t, Path: path}, nil
}
