package physical

import (
	"math"
	"testing"
)

// Against scikit-rf 0.15.4's MLine exactly as Debian ships it, with no
// corrections (testdata/skrf/mline_stock.tsv, made by
// make_mline_stock_table.py; its header records the versions and command):
// at zero copper thickness the library's known departures from the papers
// do not enter the static Z0, the static εeff or the Kirschning-Jansen
// εeff(f), so these must agree to the table's ten digits.
func TestMicrostripStockLibrary(t *testing.T) {
	table, lines := readTable(t, "mline_stock.tsv", 7)
	for k, v := range table {
		n := lines[k]
		er, h, w, freq := v[0], v[1], v[2], v[3]
		m, err := NewMicrostrip(w, Substrate{Er: er, Height: h})
		if err != nil {
			t.Fatalf("mline_stock.tsv:%d: %v", n, err)
		}
		z0, e0 := m.Static()
		p := m.At(freq)
		for _, c := range []struct {
			name      string
			got, want float64
		}{{"Z0 static", z0, v[4]}, {"εeff static", e0, v[5]}, {"εeff(f)", p.EpsEff, v[6]}} {
			if math.Abs(c.got/c.want-1) > 1e-8 {
				t.Errorf("mline_stock.tsv:%d (εr %g, W/h %.3g, f·h %.3g GHz·mm): %s %.10g, library %.10g",
					n, er, w/h, freq*h*1e-6, c.name, c.got, c.want)
			}
		}
	}
	if len(table) < 300 {
		t.Fatalf("only %d rows read", len(table))
	}
}
