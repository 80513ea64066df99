package export_test

import (
	"bytes"
	"testing"

	"stubcraft/export"
)

// The build's Touchstone files are written straight from the sweep; they
// must be byte for byte what WriteTouchstone makes of NetworkTouchstone
// and InputTouchstone, the library's copies of the same data.
func TestBuildTouchstoneEqualsWriteTouchstone(t *testing.T) {
	res, files := buildFiles(t, "")
	for _, c := range []struct {
		name string
		want func(*bytes.Buffer) error
	}{
		{"network.s2p", func(b *bytes.Buffer) error {
			return export.WriteTouchstone(b, export.NetworkTouchstone(res), export.TouchstoneComments(res, "test", "the matching network: port 1 the source side, port 2 the load port"))
		}},
		{"matched.s1p", func(b *bytes.Buffer) error {
			return export.WriteTouchstone(b, export.InputTouchstone(res), export.TouchstoneComments(res, "test", "the input of the matched load"))
		}},
	} {
		var want bytes.Buffer
		if err := c.want(&want); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(files[c.name], want.Bytes()) {
			t.Errorf("%s differs from WriteTouchstone of the same data", c.name)
		}
	}
}
