package main

import (
	"fmt"

	"stubcraft/export"
)

// pageSpec is how the drawing is printed.
type pageSpec struct {
	Size export.PageSize
	Fit  export.Fit // for a board larger than the page at 1:1
}

func parsePage(size, fit string) (pageSpec, error) {
	var p pageSpec
	var err error
	if p.Size, err = export.ParsePageSize(size); err != nil {
		return pageSpec{}, fmt.Errorf("--%w", err)
	}
	if p.Fit, err = export.ParseFit(fit); err != nil {
		return pageSpec{}, fmt.Errorf("--%w", err)
	}
	return p, nil
}
