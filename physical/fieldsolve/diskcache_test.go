package fieldsolve

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

// diskTestSection is a cheap cross-section (an ideal thin stripline solves
// in a few milliseconds) for the cache tests.
var diskTestSection = CrossSection{Geometry: Stripline, Width: 1e-3, Spacing: 2e-3, Er: 2.2}

func cacheFiles(t *testing.T, dir string) (entries, temps int) {
	t.Helper()
	des, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, de := range des {
		switch {
		case strings.HasPrefix(de.Name(), ".tmp-"):
			temps++
		case strings.HasSuffix(de.Name(), ".json"):
			entries++
		}
	}
	return entries, temps
}

func TestDiskCacheRoundTrip(t *testing.T) {
	dir := t.TempDir()
	fresh, err := Solve(diskTestSection, Options{})
	if err != nil {
		t.Fatal(err)
	}
	first := NewCacheDir(dir)
	if _, err := first.Solve(diskTestSection, Options{}); err != nil {
		t.Fatal(err)
	}
	if first.DiskHits() != 0 {
		t.Errorf("an empty directory gave %d hits", first.DiskHits())
	}
	second := NewCacheDir(dir)
	got, err := second.Solve(diskTestSection, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if second.DiskHits() != 1 {
		t.Errorf("second run: %d disk hits, want 1", second.DiskHits())
	}
	// The stored answer is the solver's, bit for bit.
	if got.Z0 != fresh.Z0 || got.EpsEff != fresh.EpsEff || got.C != fresh.C || got.CAir != fresh.CAir ||
		got.ErrorEstimate != fresh.ErrorEstimate || got.BoxError != fresh.BoxError || len(got.Levels) != len(fresh.Levels) {
		t.Errorf("cached %+v\nfresh  %+v", got, fresh)
	}
	// The default tolerance given explicitly is the same solve.
	if _, err := NewCacheDir(dir).Solve(diskTestSection, Options{Tolerance: DefaultTolerance}); err != nil {
		t.Fatal(err)
	}
	if n, _ := cacheFiles(t, dir); n != 1 {
		t.Errorf("%d entries, want 1", n)
	}
	// One bit of one input is another cross-section.
	other := diskTestSection
	other.Width = math.Nextafter(other.Width, 1)
	third := NewCacheDir(dir)
	if _, err := third.Solve(other, Options{}); err != nil {
		t.Fatal(err)
	}
	if third.DiskHits() != 0 {
		t.Error("a different width was read from the cache")
	}
}

func TestDiskCacheDamagedEntry(t *testing.T) {
	dir := t.TempDir()
	if _, err := NewCacheDir(dir).Solve(diskTestSection, Options{}); err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob(filepath.Join(dir, "*.json"))
	if len(files) != 1 {
		t.Fatalf("%d entries", len(files))
	}
	if err := os.WriteFile(files[0], []byte(`{"key": "trunc`), 0o644); err != nil {
		t.Fatal(err)
	}
	c := NewCacheDir(dir)
	r, err := c.Solve(diskTestSection, Options{})
	if err != nil || c.DiskHits() != 0 || !(r.Z0 > 0) {
		t.Errorf("damaged entry: hits %d, Z0 %g, err %v", c.DiskHits(), r.Z0, err)
	}
}

func TestDiskCacheConcurrentRuns(t *testing.T) {
	dir := t.TempDir()
	var wg sync.WaitGroup
	z := make([]float64, 4)
	for i := range z {
		wg.Add(1)
		go func() {
			defer wg.Done()
			r, err := NewCacheDir(dir).Solve(diskTestSection, Options{})
			if err != nil {
				t.Error(err)
			}
			z[i] = r.Z0
		}()
	}
	wg.Wait()
	for _, v := range z[1:] {
		if v != z[0] {
			t.Errorf("runs disagree: %v", z)
		}
	}
	if n, tmp := cacheFiles(t, dir); n != 1 || tmp != 0 {
		t.Errorf("%d entries and %d temporary files, want 1 and 0", n, tmp)
	}
}

func TestDiskCacheBounded(t *testing.T) {
	dir := t.TempDir()
	c := NewCacheDir(dir)
	c.maxEntries = 3
	for i := range 5 {
		cs := diskTestSection
		cs.Width *= 1 + 0.1*float64(i)
		if _, err := c.Solve(cs, Options{}); err != nil {
			t.Fatal(err)
		}
	}
	if n, _ := cacheFiles(t, dir); n > 3 {
		t.Errorf("%d entries kept, bound 3", n)
	}
}
