package main

import (
	"fmt"
	"strings"
)

// pageSpec is how the drawing is printed.
type pageSpec struct {
	Size string // "a4" or "letter"
	Fit  string // "scale" or "tile", for a board larger than the page at 1:1
}

func parsePage(size, fit string) (pageSpec, error) {
	p := pageSpec{Size: strings.ToLower(size), Fit: strings.ToLower(fit)}
	if p.Size != "a4" && p.Size != "letter" {
		return pageSpec{}, fmt.Errorf("--page %q: use a4 or letter", size)
	}
	if p.Fit != "scale" && p.Fit != "tile" {
		return pageSpec{}, fmt.Errorf("--fit %q: use scale or tile", fit)
	}
	return p, nil
}
