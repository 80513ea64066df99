package outdir

import (
	"context"
	"fmt"
	"path/filepath"
	"runtime"
	"sync"
)

// writeFiles writes files into dir, as many at once as there are
// processors, so that rendering one file and the fsync of another
// overlap, and returns their manifest entries in the order of files.
// The first file to fail (or a cancelled ctx) stops the files not yet
// started, and its error is returned once the started ones have finished.
func writeFiles(ctx context.Context, dir string, files []File) ([]manifestEntry, error) {
	stop, cancel := context.WithCancelCause(ctx)
	defer cancel(nil)
	entries := make([]manifestEntry, len(files))
	next := make(chan int)
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), len(files)) {
		wg.Go(func() {
			for i := range next {
				if context.Cause(stop) != nil {
					continue
				}
				f := files[i]
				sum, err := writeFile(filepath.Join(dir, f.Name), f.Write)
				if err != nil {
					cancel(fmt.Errorf("writing %s: %w", f.Name, err))
					continue
				}
				entries[i] = manifestEntry{f.Name, sum}
			}
		})
	}
	for i := range files {
		if context.Cause(stop) != nil {
			break
		}
		next <- i
	}
	close(next)
	wg.Wait()
	if err := context.Cause(stop); err != nil {
		return nil, err
	}
	return entries, nil
}
