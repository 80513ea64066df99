package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"stubcraft/stackups"
)

// loadStackup reads a preset name or a stackup TOML path.
func loadStackup(nameOrPath string) (stackups.Stackup, error) {
	st, err := stackups.Load(nameOrPath)
	if err != nil {
		return stackups.Stackup{}, fmt.Errorf("--stackup: %w", err)
	}
	return st, nil
}

// parsePositive reads a positive finite number given to flag.
func parsePositive(flag, text string) (float64, error) {
	t := strings.TrimSpace(text)
	for _, suffix := range []string{"ohms", "ohm", "Ω"} {
		t = strings.TrimSpace(strings.TrimSuffix(t, suffix))
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%s %q: not a number", flag, text)
	}
	if v <= 0 {
		return 0, fmt.Errorf("%s %q: must be positive", flag, text)
	}
	return v, nil
}
