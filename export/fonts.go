package export

import (
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/gomono"
	"golang.org/x/image/font/gofont/goregular"
)

// Font families registered in every drawing. Go's own fonts cover the
// symbols a drawing prints (Ω, εr, λ, µ, °, ±, −) and are embedded as
// UTF-8 subsets so a PDF reader extracts the text as written.
const (
	fontSans = "gosans"
	fontMono = "gomono"
)

// fontFiles returns the TrueType files of the drawing fonts by family and
// style ("" regular, "B" bold).
func fontFiles() []struct {
	family, style string
	ttf           []byte
} {
	return []struct {
		family, style string
		ttf           []byte
	}{
		{fontSans, "", goregular.TTF},
		{fontSans, "B", gobold.TTF},
		{fontMono, "", gomono.TTF},
	}
}
