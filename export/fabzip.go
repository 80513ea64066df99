package export

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"time"
)

// FabZipFileName returns the name of the fabrication archive of a board
// called base: "<base>-fab.zip".
func FabZipFileName(base string) string { return baseName(base) + "-fab.zip" }

// zipEpoch is the earliest time a zip file's MS-DOS date can hold.
var zipEpoch = time.Date(1980, 1, 1, 0, 0, 0, 0, time.UTC)

// WriteFabZip writes a zip archive of the given artefacts, in their order:
// deflated, every entry dated created (UTC; before 1980, the format's
// first day, 1980-01-01), no comment, no extra fields beyond what
// archive/zip writes for the date, mode 0644. The bytes depend only on the
// arguments, so a build with SOURCE_DATE_EPOCH reproduces it.
func WriteFabZip(w io.Writer, files []Artefact, created time.Time) error {
	t := created.UTC()
	if t.Before(zipEpoch) {
		t = zipEpoch
	}
	var buf bytes.Buffer
	z := zip.NewWriter(&buf)
	for _, a := range files {
		h := &zip.FileHeader{Name: a.Name, Method: zip.Deflate, Modified: t}
		h.SetMode(0o644)
		fw, err := z.CreateHeader(h)
		if err != nil {
			return fmt.Errorf("export: fab zip %s: %w", a.Name, err)
		}
		if err := a.Write(fw); err != nil {
			return fmt.Errorf("export: fab zip %s: %w", a.Name, err)
		}
	}
	if err := z.Close(); err != nil {
		return fmt.Errorf("export: fab zip: %w", err)
	}
	_, err := w.Write(buf.Bytes())
	return err
}
