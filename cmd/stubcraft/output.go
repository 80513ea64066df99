package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// printJSON writes v as indented JSON followed by a newline.
func printJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// artefact is one file of a build's output directory.
type artefact struct {
	name  string
	write func(io.Writer) error
}

// writeDir writes every artefact into dir so that nothing is ever half
// written: the files go into a fresh temporary directory beside dir, and
// only when all of them are complete is that directory renamed to dir.
// An existing dir is an error unless force is set, in which case it is
// replaced as a whole.
func writeDir(dir string, force bool, files []artefact) error {
	dir = filepath.Clean(dir)
	if info, err := os.Stat(dir); err == nil {
		if !force {
			return fmt.Errorf("output directory %s already exists (use --force to replace it)", dir)
		}
		if !info.IsDir() {
			return fmt.Errorf("output path %s exists and is not a directory", dir)
		}
	} else if !errors.Is(err, fs.ErrNotExist) {
		return fmt.Errorf("output directory: %w", err)
	}
	parent := filepath.Dir(dir)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return fmt.Errorf("output directory: %w", err)
	}
	tmp, err := os.MkdirTemp(parent, "."+filepath.Base(dir)+".tmp-")
	if err != nil {
		return fmt.Errorf("output directory: %w", err)
	}
	ok := false
	defer func() {
		if !ok {
			os.RemoveAll(tmp)
		}
	}()
	for _, a := range files {
		if err := writeFile(filepath.Join(tmp, a.name), a.write); err != nil {
			return fmt.Errorf("writing %s: %w", a.name, err)
		}
	}
	if err := os.Chmod(tmp, 0o755); err != nil {
		return fmt.Errorf("output directory: %w", err)
	}
	if force {
		old := tmp + ".old"
		if err := os.Rename(dir, old); err == nil {
			defer os.RemoveAll(old)
		} else if !errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("replacing %s: %w", dir, err)
		}
	}
	if err := os.Rename(tmp, dir); err != nil {
		return fmt.Errorf("output directory: %w", err)
	}
	ok = true
	return nil
}

// writeFile creates path and fills it by write, removing it on failure.
func writeFile(path string, write func(io.Writer) error) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	if err := write(f); err != nil {
		f.Close()
		os.Remove(path)
		return err
	}
	if err := f.Close(); err != nil {
		os.Remove(path)
		return err
	}
	return nil
}
