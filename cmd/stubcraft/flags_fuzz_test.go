package main

import (
	"strings"
	"testing"
)

// FuzzQuantityFlags gives trace and solve arbitrary quantity flags: no
// panic, and what they print on success holds no NaN or infinity (a
// refusal is an error that names its flag).
func FuzzQuantityFlags(f *testing.F) {
	for _, s := range [][4]string{
		{"2.45GHz", "1.2mm", "31-j24", "50"},
		{"1e20Hz", "1e-300um", "31-j", "1e308"},
		{"1mHz", "1Mm", "50+j", "0"},
		{"915 MHz", "7e22m", "1e9+j0", "-5"},
		{"NaN GHz", "1e300mm", "0-j24", "50 ohm"},
	} {
		f.Add(s[0], s[1], s[2], s[3])
	}
	f.Fuzz(func(t *testing.T, freq, width, load, z0 string) {
		for _, args := range [][]string{
			{"trace", "--stackup", "fr4-1.6mm", "--freq", freq, "--width", width, "--json"},
			{"trace", "--stackup", "fr4-1.6mm", "--freq", freq, "--z0", z0, "--length", "90deg"},
			{"solve", "--load", load, "--z0", z0, "--json"},
			{"solve", "--load", load, "--line-z0", z0},
		} {
			out, err := runRoot(t, args...)
			if err != nil {
				if !strings.Contains(err.Error(), "--") {
					t.Fatalf("%q: error %q names no flag", args, err)
				}
				continue
			}
			for _, bad := range []string{"NaN", "Inf", "∞ Ω"} {
				if strings.Contains(out, bad) {
					t.Fatalf("%q printed %q:\n%s", args, bad, out)
				}
			}
		}
	})
}
