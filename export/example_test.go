package export_test

import (
	"bytes"
	"context"
	"fmt"
	"strings"
	"time"

	"stubcraft/export"
	"stubcraft/synth"
)

// From a design file to Gerber artwork in memory: load the embedded demo
// design (synth.LoadDesign takes a path, synth.ReadDesign an io.Reader),
// build it, and write the top copper layer into a buffer.
func Example() {
	in, err := synth.LoadDemo(synth.LoadOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	in.SkipTolerance = true // no Monte Carlo for this example
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		fmt.Println(err) // a refusal: errors.As finds *synth.MismatchError and the others
		return
	}
	var buf bytes.Buffer
	meta := export.Meta{ProjectName: res.Design.Name, Version: "0.1.0", Created: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)}
	if err := export.WriteGerber(&buf, res.Layout, export.CopperTop, meta); err != nil {
		fmt.Println(err)
		return
	}
	for _, line := range strings.Split(buf.String(), "\n")[:6] {
		fmt.Println(line)
	}
	fmt.Printf("%s is %.2f mm wide\n", res.Physical.Elements[0].ID, res.Physical.Elements[0].Width*1e3)
	// Output:
	// %TF.GenerationSoftware,stubcraft,stubcraft,0.1.0*%
	// %TF.CreationDate,2026-01-01T00:00:00+00:00*%
	// %TF.ProjectId,soil-probe-match,dc589188-2d93-5ff8-9b54-510b0cda2dcc,1*%
	// %TF.SameCoordinates,dc589188-2d93-5ff8-9b54-510b0cda2dcc*%
	// %TF.FileFunction,Copper,L1,Top*%
	// %TF.FilePolarity,Positive*%
	// feed-load is 3.05 mm wide
}
