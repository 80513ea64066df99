package fieldsolve

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"
)

// diskFormat names the solver's numbers in the on-disk cache: change it
// whenever a change to Solve moves its results, so that no older answer is
// read back.
const diskFormat = "fieldsolve-2"

// DiskCacheEntries is the most solved cross-sections the on-disk cache
// keeps; beyond it the least recently used are removed.
const DiskCacheEntries = 2000

// NewCacheDir returns a cache that also keeps its results in dir, one file
// per cross-section and accuracy, so that a later run does not solve them
// again. Entries are keyed by the exact inputs (every field of the
// cross-section bit for bit, the tolerance, the cell limit and the solver's
// format), written to a temporary file and renamed into place, so concurrent
// runs never read a partial entry; an entry that cannot be read is solved
// again. The directory holds at most DiskCacheEntries entries. A cache that
// cannot be written is not an error: the results are still returned and kept
// in memory. An empty dir gives a memory-only cache, as NewCache.
func NewCacheDir(dir string) *Cache {
	c := NewCache()
	c.dir, c.maxEntries = dir, DiskCacheEntries
	return c
}

// DiskHits returns how many results were read from the on-disk cache.
func (c *Cache) DiskHits() int {
	if c == nil {
		return 0
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.diskHits
}

// Dir returns the on-disk cache directory, "" for a memory-only cache.
func (c *Cache) Dir() string {
	if c == nil {
		return ""
	}
	return c.dir
}

// diskEntry is the content of one cache file; Key is checked on reading.
type diskEntry struct {
	Key    string `json:"key"`
	Result Result `json:"result"`
}

// diskKey is the canonical text of the inputs of a solve: every float as
// its bits.
func diskKey(k cacheKey) string {
	tol := k.tol
	if tol == 0 {
		tol = DefaultTolerance
	}
	cells := k.maxCells
	if cells == 0 {
		cells = DefaultMaxCells
	}
	cs := k.cs
	var b strings.Builder
	b.WriteString(diskFormat)
	b.WriteString(" g")
	b.WriteString(strconv.Itoa(int(cs.Geometry)))
	for _, v := range []float64{cs.Width, cs.Height, cs.Thickness, cs.Er, cs.EtchAngleDeg,
		cs.MaskThickness, cs.MaskEr, cs.Gap, cs.GroundWidth, cs.Spacing, cs.Offset, tol} {
		b.WriteByte(' ')
		b.WriteString(strconv.FormatUint(math.Float64bits(v), 16))
	}
	b.WriteString(" c")
	b.WriteString(strconv.Itoa(cells))
	return b.String()
}

func diskName(key string) string {
	sum := sha256.Sum256([]byte(key))
	return hex.EncodeToString(sum[:16]) + ".json"
}

// load returns the stored result for k, if a valid one is on disk.
func (c *Cache) load(k cacheKey) (Result, bool) {
	key := diskKey(k)
	path := filepath.Join(c.dir, diskName(key))
	data, err := os.ReadFile(path)
	if err != nil {
		return Result{}, false
	}
	var e diskEntry
	if json.Unmarshal(data, &e) != nil || e.Key != key || len(e.Result.Levels) == 0 {
		return Result{}, false
	}
	now := time.Now()
	_ = os.Chtimes(path, now, now) // recently used
	return e.Result, true
}

// save stores r for k; failures are ignored (the cache is an optimisation).
func (c *Cache) save(k cacheKey, r Result) {
	key := diskKey(k)
	data, err := json.Marshal(diskEntry{Key: key, Result: r})
	if err != nil { // e.g. an infinite error estimate
		return
	}
	if err := os.MkdirAll(c.dir, 0o755); err != nil {
		return
	}
	f, err := os.CreateTemp(c.dir, ".tmp-*")
	if err != nil {
		return
	}
	_, werr := f.Write(data)
	if cerr := f.Close(); werr != nil || cerr != nil {
		os.Remove(f.Name())
		return
	}
	if os.Rename(f.Name(), filepath.Join(c.dir, diskName(key))) != nil {
		os.Remove(f.Name())
		return
	}
	c.prune()
}

// prune removes the least recently used entries beyond c.maxEntries,
// down to nine tenths of it, and temporary files over an hour old (left by
// a run that was killed while writing).
func (c *Cache) prune() {
	des, err := os.ReadDir(c.dir)
	if err != nil {
		return
	}
	type entry struct {
		name string
		t    time.Time
	}
	var entries []entry
	for _, de := range des {
		name := de.Name()
		info, err := de.Info()
		if err != nil {
			continue
		}
		if strings.HasPrefix(name, ".tmp-") {
			if time.Since(info.ModTime()) > time.Hour {
				os.Remove(filepath.Join(c.dir, name))
			}
			continue
		}
		if strings.HasSuffix(name, ".json") {
			entries = append(entries, entry{name, info.ModTime()})
		}
	}
	if len(entries) <= c.maxEntries {
		return
	}
	sort.Slice(entries, func(i, j int) bool { return entries[i].t.Before(entries[j].t) })
	for _, e := range entries[:len(entries)-c.maxEntries*9/10] {
		os.Remove(filepath.Join(c.dir, e.name))
	}
}
