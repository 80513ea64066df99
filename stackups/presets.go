package stackups

import (
	"bytes"
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"path"
	"sort"
	"strings"

	"stubcraft/physical/inputfile"
)

// presetFiles holds the presets, one file per preset named after it.
//
//go:embed presets/*.toml
var presetFiles embed.FS

// Presets returns every embedded preset, sorted by name. Each call decodes
// them afresh, so the caller may change what it gets.
func Presets() []Stackup {
	entries, err := fs.ReadDir(presetFiles, "presets")
	if err != nil {
		panic(fmt.Sprintf("stackups: embedded presets: %v", err))
	}
	out := make([]Stackup, 0, len(entries))
	for _, e := range entries {
		name, ok := strings.CutSuffix(e.Name(), ".toml")
		if !ok {
			continue
		}
		s, _ := Preset(name)
		out = append(out, s)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Name < out[j].Name })
	return out
}

// Preset returns the embedded preset of that name, and whether there is
// one.
func Preset(name string) (Stackup, bool) {
	file := path.Join("presets", name+".toml")
	if strings.ContainsAny(name, `/\`) || !fs.ValidPath(file) {
		return Stackup{}, false
	}
	data, err := presetFiles.ReadFile(file)
	if err != nil {
		return Stackup{}, false
	}
	s, err := Decode(bytes.NewReader(data), file)
	if err != nil {
		// The tests decode every preset; reaching this is a build with a
		// broken preset file.
		panic(fmt.Sprintf("stackups: embedded preset %s: %v", name, err))
	}
	return s, true
}

// presetNames lists the preset names, sorted.
func presetNames() []string {
	var names []string
	for _, s := range Presets() {
		names = append(names, s.Name)
	}
	return names
}

// Load returns the preset called nameOrPath or, when there is none, the
// stackup in the file at that path. A name that ends in ".toml" or holds a
// path separator is always a path.
func Load(nameOrPath string) (Stackup, error) {
	isPath := strings.HasSuffix(nameOrPath, ".toml") || strings.ContainsAny(nameOrPath, `/\`)
	if !isPath {
		if s, ok := Preset(nameOrPath); ok {
			return s, nil
		}
	}
	data, err := inputfile.Read(nameOrPath, inputfile.TOMLLimit)
	if err != nil {
		if !isPath && errors.Is(err, fs.ErrNotExist) {
			return Stackup{}, fmt.Errorf("no preset named %q and no such file (presets: %s): %w",
				nameOrPath, strings.Join(presetNames(), ", "), err)
		}
		return Stackup{}, fmt.Errorf("reading stackup: %w", err)
	}
	return Decode(bytes.NewReader(data), nameOrPath)
}
