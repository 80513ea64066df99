package fdtd

import (
	"fmt"
	"sync/atomic"
	"testing"
	"time"
)

// TestTeamCoversEveryIndexOnce runs many rounds of the worker team with
// work of varying length, parking at once and spinning first, and checks
// that each round calls every index exactly once and that run returns only
// after all of them (a lost or stale wake-up shows as a missed index, a
// hang or a race under -race).
func TestTeamCoversEveryIndexOnce(t *testing.T) {
	for _, c := range []struct {
		workers int
		spin    time.Duration
	}{
		{2, 0}, {2, spinWait}, {3, 0}, {3, time.Microsecond}, {4, spinWait},
	} {
		t.Run(fmt.Sprintf("workers=%d,spin=%v", c.workers, c.spin), func(t *testing.T) {
			tm := newTeam(c.workers, c.spin)
			defer tm.stop()
			const n = 7
			var hits [n]atomic.Int32
			for round := range 20000 {
				width := 1 + round%n // fewer indices than workers too
				tm.run(width, func(a, b int) {
					for i := a; i < b; i++ {
						if round%50 == 0 {
							time.Sleep(time.Duration(i) * time.Microsecond)
						}
						hits[i].Add(1)
					}
				})
				for i := range n {
					want := int32(0)
					if i < width {
						want = 1
					}
					if got := hits[i].Swap(0); got != want {
						t.Fatalf("round %d (n = %d): index %d ran %d times when run returned, want %d", round, width, i, got, want)
					}
				}
			}
		})
	}
}
