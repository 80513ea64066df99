package export

import (
	"math"
	"strconv"
	"testing"
)

// Every labelled tick reads its own value, and the marked f0 gets a tick
// labelled exactly; expected labels written by hand.
func TestMarkedTickerLabelsReadTheirValues(t *testing.T) {
	cases := []struct {
		lo, hi, mark float64
		want         string // label of the tick at mark
	}{
		{2.3, 2.6, 2.45, "2.45"},     // a 2.3–2.6 GHz sweep round 2.45 GHz
		{1.9, 3.0, 2.45, "2.45"},     // the example sweep
		{360, 490, 433.92, "433.92"}, // MHz
		{5.5, 6.1, 5.8, "5.8"},
	}
	for _, c := range cases {
		got := ""
		labelled := 0
		for _, tk := range (markedTicker{marks: []float64{c.mark}}).Ticks(c.lo, c.hi) {
			if tk.Label == "" {
				continue
			}
			labelled++
			v, err := strconv.ParseFloat(tk.Label, 64)
			if err != nil || math.Abs(v-tk.Value) > 1e-9*math.Abs(tk.Value) {
				t.Errorf("%g–%g: tick at %g labelled %q", c.lo, c.hi, tk.Value, tk.Label)
			}
			if tk.Value == c.mark {
				got = tk.Label
			}
		}
		if got != c.want {
			t.Errorf("%g–%g: the tick at %g reads %q, want %q", c.lo, c.hi, c.mark, got, c.want)
		}
		if labelled < 3 {
			t.Errorf("%g–%g: only %d labelled ticks", c.lo, c.hi, labelled)
		}
	}
}
