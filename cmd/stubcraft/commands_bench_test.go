package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"syscall"
	"testing"
	"time"
)

// BenchmarkCommands times whole commands of the built binary against a bare
// start (stubcraft --version), alternated in one run, for the speed goals
// of the project (go test ./cmd/stubcraft -run - -bench Commands):
//
//	trace on fr4-1.6mm-masked (field solver)   ≤ 6 × a bare start
//	build of testdata/designs/gcpw-probe.toml  ≤ 15 ×
//	demo build (closed forms)                  ≤ 10 ×
//	compare over every preset                  ≤ 10 ×
//	a build with 100,001 sweep points          ≤ 0.6 s
//	peak memory of each                        ≤ 64 MiB
//
// Each iteration runs --version and the command once; the metrics are the
// ratio of their medians (x-bare), the command's median in seconds (s/cmd)
// and the largest peak RSS of the command's runs (MiB-peak, from
// getrusage of the child). Every command run gets a new, empty cache
// directory and output directory, so the goals are measured on a first run.
//
// With STUBCRAFT_BENCH_BASELINE set to another stubcraft binary, each
// iteration also runs the same command with it, and x-baseline is the
// ratio of the baseline's median to this build's: an A/B in one run.
func BenchmarkCommands(b *testing.B) {
	tmp := b.TempDir()
	bin := filepath.Join(tmp, "stubcraft")
	build := exec.Command("go", "build", "-o", bin, ".")
	if out, err := build.CombinedOutput(); err != nil {
		b.Fatalf("go build: %v\n%s", err, out)
	}
	baseline := os.Getenv("STUBCRAFT_BENCH_BASELINE")
	demo, err := os.ReadFile(filepath.Join("..", "..", "synth", "demo", "soil-probe.toml"))
	if err != nil {
		b.Fatal(err)
	}
	bigSweep := filepath.Join(tmp, "sweep-100001.toml")
	big := append(slices.Clone(demo), "\n[sweep]\npoints = 100001\n"...)
	if err := os.WriteFile(bigSweep, big, 0o644); err != nil {
		b.Fatal(err)
	}
	gcpw, err := filepath.Abs(filepath.Join("..", "..", "testdata", "designs", "gcpw-probe.toml"))
	if err != nil {
		b.Fatal(err)
	}
	cases := []struct {
		name string
		args []string // "OUT" is replaced by a new output directory
	}{
		{"trace-masked", []string{"trace", "--stackup", "fr4-1.6mm-masked", "--z0", "50", "--freq", "2.45GHz"}},
		{"build-gcpw-probe", []string{"build", gcpw, "-o", "OUT"}},
		{"build-demo", []string{"build", "-o", "OUT"}},
		{"compare-presets", []string{"compare"}},
		{"build-sweep-100001", []string{"build", bigSweep, "-o", "OUT"}},
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			var bare, cmd, base []time.Duration
			var peak int64
			n := 0
			for b.Loop() {
				d, _ := runBinary(b, bin, tmp, n, "--version")
				bare = append(bare, d)
				d, rss := runBinary(b, bin, tmp, n, c.args...)
				cmd = append(cmd, d)
				peak = max(peak, rss)
				if baseline != "" {
					d, _ := runBinary(b, baseline, tmp, n, c.args...)
					base = append(base, d)
				}
				n++
			}
			b.ReportMetric(float64(median(cmd))/float64(median(bare)), "x-bare")
			b.ReportMetric(median(cmd).Seconds(), "s/cmd")
			b.ReportMetric(float64(peak)/1024, "MiB-peak")
			if baseline != "" {
				b.ReportMetric(float64(median(base))/float64(median(cmd)), "x-baseline")
			}
		})
	}
}

// runBinary runs bin with args, an empty cache directory and a new output
// directory (for the argument "OUT"), and returns the wall time and the
// child's peak RSS in KiB.
func runBinary(b *testing.B, bin, tmp string, n int, args ...string) (time.Duration, int64) {
	b.Helper()
	run, err := os.MkdirTemp(tmp, "run")
	if err != nil {
		b.Fatal(err)
	}
	defer os.RemoveAll(run)
	argv := slices.Clone(args)
	for i, a := range argv {
		if a == "OUT" {
			argv[i] = filepath.Join(run, "out")
		}
	}
	cmd := exec.Command(bin, argv...)
	cmd.Env = append(os.Environ(), "STUBCRAFT_CACHE_DIR="+filepath.Join(run, "cache"), "XDG_CACHE_HOME="+filepath.Join(run, "xdg"))
	start := time.Now()
	out, err := cmd.CombinedOutput()
	d := time.Since(start)
	if err != nil {
		b.Fatalf("%s %v: %v\n%s", bin, argv, err, out)
	}
	var rss int64
	if ru, ok := cmd.ProcessState.SysUsage().(*syscall.Rusage); ok {
		rss = ru.Maxrss
	}
	return d, rss
}

func median(d []time.Duration) time.Duration {
	s := slices.Clone(d)
	slices.Sort(s)
	return s[len(s)/2]
}
