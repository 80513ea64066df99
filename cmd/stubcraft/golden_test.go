package main

import (
	"bufio"
	"crypto/sha256"
	"encoding/hex"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"stubcraft/cmd/stubcraft/internal/outdir"
)

var updateGolden = flag.Bool("update-golden", false, "rewrite testdata/golden/artefacts.sha256 (say why in the commit)")

// goldenPath holds the SHA-256 of every artefact of the demo and of every
// example design, built with SOURCE_DATE_EPOCH. A refactor must leave them
// byte-identical; an intended change of output updates them with
// -update-golden in a commit that says why.
const goldenPath = "../../testdata/golden/artefacts.sha256"

// goldenBuilds lists the builds whose artefacts are hashed: the demo and
// every example design that builds (with --accept-mismatch for the one that
// is meant not to match).
func goldenBuilds(t *testing.T) map[string][]string {
	t.Helper()
	builds := map[string][]string{"demo": nil}
	files, err := filepath.Glob(filepath.Join("..", "..", "testdata", "designs", "*.toml"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no example designs: %v", err)
	}
	for _, file := range files {
		base := filepath.Base(file)
		if strings.HasPrefix(base, "bad-") {
			continue
		}
		builds[strings.TrimSuffix(base, ".toml")] = []string{file, "--accept-mismatch"}
	}
	return builds
}

func TestArtefactHashesUnchanged(t *testing.T) {
	if testing.Short() {
		t.Skip("builds every example design")
	}
	t.Setenv("SOURCE_DATE_EPOCH", "1767225600")
	got := map[string]string{}
	for name, args := range goldenBuilds(t) {
		dir := filepath.Join(t.TempDir(), "out")
		t.Setenv(cacheDirEnv, filepath.Join(t.TempDir(), "cache")) // every build from an empty cache
		argv := append([]string{"build"}, args...)
		argv = append(argv, "-o", dir, "--samples", "200")
		if _, err := runRoot(t, argv...); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		entries, err := os.ReadDir(dir)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range entries {
			if e.Name() == outdir.ManifestName {
				continue // derived from the others: their names and SHA-256
			}
			data, err := os.ReadFile(filepath.Join(dir, e.Name()))
			if err != nil {
				t.Fatal(err)
			}
			sum := sha256.Sum256(data)
			got[name+"/"+e.Name()] = hex.EncodeToString(sum[:])
		}
	}
	if *updateGolden {
		keys := make([]string, 0, len(got))
		for k := range got {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		var b strings.Builder
		b.WriteString("# SHA-256 of every build artefact: go test ./cmd/stubcraft -run TestArtefactHashesUnchanged -update-golden\n")
		b.WriteString("# SOURCE_DATE_EPOCH=1767225600, --samples 200; update only in a commit that says why an output changed\n")
		for _, k := range keys {
			fmt.Fprintf(&b, "%s  %s\n", got[k], k)
		}
		if err := os.WriteFile(goldenPath, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	f, err := os.Open(goldenPath)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	want := map[string]string{}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || line == "" {
			continue
		}
		sum, name, ok := strings.Cut(line, "  ")
		if !ok {
			t.Fatalf("%s: malformed line %q", goldenPath, line)
		}
		want[name] = sum
	}
	for name, sum := range want {
		if got[name] == "" {
			t.Errorf("%s: no longer written", name)
		} else if got[name] != sum {
			t.Errorf("%s: changed (sha256 %s, recorded %s)", name, got[name][:12], sum[:12])
		}
	}
	for name := range got {
		if want[name] == "" {
			t.Errorf("%s: new artefact, not recorded", name)
		}
	}
}
