package outdir

import (
	"bufio"
	"encoding/hex"
	"fmt"
	"io"
	"os"
	"strings"
)

// ManifestName is the file in every output directory that lists the
// build's files with their SHA-256. Its presence marks a directory this
// package wrote.
const ManifestName = "stubcraft-manifest.sha256"

// manifestHeader is the first line of a manifest.
const manifestHeader = "# stubcraft output directory: every file of the build and its SHA-256 (sha256sum -c reads it)"

// manifestEntry is one file of a manifest.
type manifestEntry struct {
	name   string
	sha256 [32]byte
}

// writeManifest writes the manifest of entries to w.
func writeManifest(w io.Writer, entries []manifestEntry) error {
	var b strings.Builder
	b.WriteString(manifestHeader + "\n")
	b.WriteString("# stubcraft build --force replaces this directory only while it holds nothing else.\n")
	for _, e := range entries {
		fmt.Fprintf(&b, "%s  %s\n", hex.EncodeToString(e.sha256[:]), e.name)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// readManifest reads the manifest at path and returns its files by name.
// A file without the header is not a manifest of this package.
func readManifest(path string) (map[string][32]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	if !sc.Scan() || sc.Text() != manifestHeader {
		if err := sc.Err(); err != nil {
			return nil, fmt.Errorf("%s: %w", path, err)
		}
		return nil, fmt.Errorf("%s: not a stubcraft manifest (its first line is not the header)", path)
	}
	files := map[string][32]byte{}
	for n := 2; sc.Scan(); n++ {
		line := sc.Text()
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		sum, name, ok := strings.Cut(line, "  ")
		raw, err := hex.DecodeString(sum)
		if !ok || err != nil || len(raw) != 32 || !validName(name) {
			return nil, fmt.Errorf("%s:%d: not a SHA-256 and a file name: %q", path, n, line)
		}
		files[name] = [32]byte(raw)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return files, nil
}

// validName reports whether name is a plain file name: not empty, no path
// separator, not "." or "..".
func validName(name string) bool {
	return name != "" && name != "." && name != ".." && !strings.ContainsAny(name, `/\`)
}
