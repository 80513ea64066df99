package fdtd

import (
	"runtime"
	"testing"
)

// BenchmarkCellUpdates times whole time steps (H, E, CPML, PEC) on the
// grid of a 40 mm straight line on 1.6 mm FR-4-class substrate at the
// normal mesh and reports Yee-cell updates per wall-clock second
// (Mcells/s) and per CPU second summed over the workers (Mcells/cpu-s,
// which the machine's load changes far less).
//
// The sub-benchmarks compare, in one run, the worker team as the solver
// uses it (every processor, spinning briefly before parking) with one
// worker (no helpers, so no hand-offs) and with every processor parking at
// once (plain hand-offs). The first two step on the team newSim starts;
// only the last replaces it, before the timing starts.
func BenchmarkCellUpdates(b *testing.B) {
	s := straight(4.35, 1.6e-3, 3e-3, 40e-3, []float64{1e9, 3e9})
	g, err := NewGrid(s, Normal.Params())
	if err != nil {
		b.Fatal(err)
	}
	procs := runtime.GOMAXPROCS(0)
	for _, c := range []struct {
		name       string
		workers    int
		parkAtOnce bool
	}{
		{"solver", procs, false},
		{"one-worker", 1, false},
		{"park-at-once", procs, true},
	} {
		b.Run(c.name, func(b *testing.B) {
			m := newSim(g, s, c.workers)
			defer m.close()
			if c.parkAtOnce {
				m.team.stop()
				m.team = newTeam(c.workers, 0)
			}
			benchSteps(b, m, g)
		})
	}
}

// benchSteps times b.N steps of m and reports the cell-update rates.
func benchSteps(b *testing.B, m *sim, g *Grid) {
	cpu0 := cpuSeconds()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		m.step()
	}
	b.StopTimer()
	updates := float64(g.Cells()) * float64(b.N)
	b.ReportMetric(updates/b.Elapsed().Seconds()/1e6, "Mcells/s")
	if cpu := cpuSeconds() - cpu0; cpu > 0 {
		b.ReportMetric(updates/cpu/1e6, "Mcells/cpu-s")
	}
	b.ReportMetric(float64(g.Cells()), "cells")
}

// BenchmarkConformalMask times whole time steps of a masked line of 35 µm
// copper on a 0.2 mm board (the thin board of the examples, normal mesh):
// "conformal" with the mask following the copper (the fixes after each E
// update), "layered" the same grid and coefficients with the fixes left
// out, in one run, so that their ratio is the fixes' cost.
func BenchmarkConformalMask(b *testing.B) {
	s := straight(4.1, 0.2e-3, 0.38e-3, 40e-3, []float64{2e9, 3e9})
	s.CopperThickness, s.Mask = 35e-6, Mask{Thickness: 20e-6, Er: 3.5}
	g, err := NewGrid(s, Normal.Params())
	if err != nil {
		b.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		conformal bool
	}{{"conformal", true}, {"layered", false}} {
		b.Run(c.name, func(b *testing.B) {
			m := newSim(g, s, 0)
			defer m.close()
			n := len(m.fixes[0]) + len(m.fixes[1]) + len(m.fixes[2])
			if n == 0 {
				b.Fatal("no conformal fixes on a masked thick-copper line")
			}
			if !c.conformal {
				m.fixes = [3]fixList{}
			}
			benchSteps(b, m, g)
			b.ReportMetric(float64(n), "fixes")
		})
	}
}
