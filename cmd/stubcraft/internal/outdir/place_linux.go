package outdir

import (
	"errors"
	"os"

	"golang.org/x/sys/unix"
)

// place puts the complete directory tmp at dir. An existing dir is
// exchanged with tmp in one step (renameat2 RENAME_EXCHANGE), so dir is
// never missing; the old content is then at the returned path, for the
// caller to remove. A new dir is renamed in without replacing anything
// that appeared meanwhile (RENAME_NOREPLACE). File systems without these
// flags get the portable two renames.
func place(tmp, dir string, exists bool) (old string, err error) {
	flags := uint(unix.RENAME_NOREPLACE)
	if exists {
		flags = unix.RENAME_EXCHANGE
	}
	err = unix.Renameat2(unix.AT_FDCWD, tmp, unix.AT_FDCWD, dir, flags)
	if errors.Is(err, unix.EINVAL) || errors.Is(err, unix.ENOSYS) {
		return placeByRenames(tmp, dir, exists)
	}
	if err != nil {
		return "", &os.LinkError{Op: "renameat2", Old: tmp, New: dir, Err: err}
	}
	if exists {
		return tmp, nil
	}
	return "", nil
}
