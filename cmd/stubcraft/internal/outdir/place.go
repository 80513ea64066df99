package outdir

import (
	"errors"
	"io/fs"
	"os"
)

// placeByRenames moves an existing dir aside (to tmp + "-old", which
// removeStale also recognises) and tmp in its place, moving the old one
// back if that fails. Between the two renames dir is missing; it is the
// fallback where no atomic exchange exists.
func placeByRenames(tmp, dir string, exists bool) (old string, err error) {
	if exists {
		old = tmp + "-old"
		if err := os.Rename(dir, old); err != nil {
			if errors.Is(err, fs.ErrNotExist) {
				old = ""
			} else {
				return "", err
			}
		}
	} else if _, err := os.Lstat(dir); err == nil {
		return "", &os.LinkError{Op: "rename", Old: tmp, New: dir, Err: fs.ErrExist}
	}
	if err := os.Rename(tmp, dir); err != nil {
		if old != "" {
			os.Rename(old, dir)
		}
		return "", err
	}
	return old, nil
}
