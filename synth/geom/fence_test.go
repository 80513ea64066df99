package geom

import (
	"errors"
	"math"
	"sort"
	"testing"
)

func fence() *FenceSpec {
	return &FenceSpec{Pitch: 2e-3, Offset: 1e-3, Drill: 0.3e-3, Pad: 0.6e-3}
}

// fenceVias returns the centres of the ground vias of l that are not
// inside a landing's ground pad.
func fenceVias(l Layout) []Point {
	var out []Point
	for _, v := range l.Vias {
		if v.Net != NetGround {
			continue
		}
		in := false
		for _, p := range l.Pads {
			if p.Pin != "" && p.Net == NetGround && v.Center.X > p.Center.X-p.W/2 && v.Center.X < p.Center.X+p.W/2 &&
				v.Center.Y > p.Center.Y-p.H/2 && v.Center.Y < p.Center.Y+p.H/2 {
				in = true
			}
		}
		if !in {
			out = append(out, v.Center)
		}
	}
	return out
}

// TestFenceStraightLine works a fence out by hand: a 1 × 10 mm line,
// 5 mm margin, 0.3 mm pull-back, fence 1 mm from the line at 2 mm pitch
// with 0.6 mm pads. Board 10 × 11 mm, centre line y = 5.5 mm; rows at
// y = 5.5 ± (0.5 + 1) = 7.0 and 4.0 mm; a via centre keeps the pad plus
// 0.2 mm (0.8 mm) from the pulled-back edge at x = 0.3 mm, so a row runs
// over x 1.1..8.9 mm: 7.8 mm holds 4 vias at 2 mm, centred: x = 2, 4, 6,
// 8 mm.
func TestFenceStraightLine(t *testing.T) {
	s := Spec{Name: "line", Segments: []Segment{{"a", 1e-3, 10e-3}}, Margin: 5e-3, EdgeClearance: 0.3e-3, Fence: fence()}
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	got := fenceVias(l)
	sort.Slice(got, func(i, j int) bool { return got[i].Y < got[j].Y || got[i].Y == got[j].Y && got[i].X < got[j].X })
	var want []Point
	for _, y := range []int64{4e6, 7e6} {
		for _, x := range []int64{2e6, 4e6, 6e6, 8e6} {
			want = append(want, Point{x, y})
		}
	}
	if len(got) != len(want) {
		t.Fatalf("fence vias %v, want %v", got, want)
	}
	for i := range got {
		if got[i] != want[i] {
			t.Errorf("via %d at %v, want %v", i, got[i], want[i])
		}
	}
	for _, v := range l.Vias {
		if v.Drill != 0.3e6 || v.Pad != 0.6e6 || v.Net != NetGround {
			t.Errorf("fence via %+v, want 0.3/0.6 mm on GND", v)
		}
	}
}

// TestFenceRules checks the rules a fence keeps on the reference network
// (two stubs, a via pad, port pads), bent (a mitred L) and with
// edge-launch landings: every fence via centre at least the offset from
// the RF copper, every two via centres at least the pad plus 0.2 mm apart
// (a fence via and a stub or landing via included), a pad plus 0.2 mm inside the
// pulled-back edge, off the landings' ground pads by the same; and some
// vias exactly the offset from the line (rows along it). On the bent
// stub, a row follows its second leg: vias at y = 10.4 − 1 = 9.4 mm (the
// leg's lower edge less the offset; leg centre 11.0 mm, 1.2 mm wide) to
// the right of its first leg (x > 8.8 + 1 mm).
func TestFenceRules(t *testing.T) {
	straight := refSpec()
	straight.EdgeClearance, straight.Fence = 0.3e-3, fence()
	bent := bentSpec()
	bent.EdgeClearance, bent.Fence = 0.3e-3, fence()
	landed := launchSpec()
	landed.Fence = fence()
	for _, c := range []struct {
		name string
		s    Spec
	}{{"straight", straight}, {"bent", bent}, {"landing", landed}} {
		t.Run(c.name, func(t *testing.T) {
			l, err := Build(c.s)
			if err != nil {
				t.Fatal(err)
			}
			vias := fenceVias(l)
			if len(vias) < 10 {
				t.Fatalf("%d fence vias", len(vias))
			}
			rf := l.Copper[0].Outline
			_, bmax := l.Board.Bounds()
			onRow, leg := 0, 0
			for _, v := range vias {
				d := rectPolygonDistance(Rect{v, v}, rf)
				for _, p := range l.Pads {
					if p.Function == SMDPad && p.Net == NetRF {
						d = math.Min(d, rectDistance(v, Rect{Point{p.Center.X - p.W/2, p.Center.Y - p.H/2}, Point{p.Center.X + p.W/2, p.Center.Y + p.H/2}}))
					}
				}
				if d < 1e6-1 {
					t.Errorf("fence via %v is %.0f nm from the RF copper, want ≥ 1 mm", v, d)
				}
				if math.Abs(d-1e6) < 1 {
					onRow++
				}
				if e := min(v.X, bmax.X-v.X, v.Y, bmax.Y-v.Y); e < 0.3e6+0.8e6 {
					t.Errorf("fence via %v is %d nm from the board edge, want ≥ 1.1 mm", v, e)
				}
				for _, p := range l.Pads {
					if p.Pin != "" && p.Net == NetGround {
						r := Rect{Point{p.Center.X - p.W/2, p.Center.Y - p.H/2}, Point{p.Center.X + p.W/2, p.Center.Y + p.H/2}}
						if d := rectDistance(v, r); d < 0.5e6 {
							t.Errorf("fence via %v is %.0f nm from ground pad %s, want ≥ 0.5 mm", v, d, p.Pin)
						}
					}
				}
				if v.Y == 9.4e6 && v.X > 9.8e6 {
					leg++
				}
			}
			isFence := map[Point]bool{}
			for _, v := range vias {
				isFence[v] = true
			}
			for i, a := range l.Vias {
				for _, b := range l.Vias[i+1:] {
					if !isFence[a.Center] && !isFence[b.Center] {
						continue // the landing's own vias are tested with the landing
					}
					if d := math.Hypot(float64(a.Center.X-b.Center.X), float64(a.Center.Y-b.Center.Y)); d < 0.8e6 {
						t.Errorf("vias at %v and %v are %.0f nm apart, want ≥ 0.8 mm", a.Center, b.Center, d)
					}
				}
			}
			if onRow < 4 {
				t.Errorf("%d fence vias exactly 1 mm from the copper, want rows of them", onRow)
			}
			if c.name == "bent" && leg == 0 {
				t.Error("no fence via follows the bent stub's second leg at y = 9.4 mm")
			}
		})
	}
}

// rectDistance is the Euclidean distance from p to the rectangle r.
func rectDistance(p Point, r Rect) float64 {
	dx := float64(max(r.Min.X-p.X, 0, p.X-r.Max.X))
	dy := float64(max(r.Min.Y-p.Y, 0, p.Y-r.Max.Y))
	return math.Hypot(dx, dy)
}

// A fence is refused beside a coplanar pour, with a pitch that puts the
// pads closer than 0.2 mm, and with an offset that puts them on the copper.
func TestFenceRefused(t *testing.T) {
	cpw := cpwSpec()
	cpw.Fence = fence()
	tight := refSpec()
	tight.Fence = fence()
	tight.Fence.Pitch = 0.7e-3
	near := refSpec()
	near.Fence = fence()
	near.Fence.Offset = 0.35e-3
	for _, c := range []struct {
		name string
		s    Spec
	}{{"coplanar", cpw}, {"pitch", tight}, {"offset", near}} {
		if _, err := Build(c.s); !errors.Is(err, ErrRange) {
			t.Errorf("%s: err %v, want ErrRange", c.name, err)
		}
	}
}
