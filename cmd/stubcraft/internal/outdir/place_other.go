//go:build !linux

package outdir

// place puts the complete directory tmp at dir by placeByRenames: without
// an atomic exchange the old directory stays until the new one is
// complete and moves aside only immediately before the new one moves in.
func place(tmp, dir string, exists bool) (old string, err error) {
	return placeByRenames(tmp, dir, exists)
}
