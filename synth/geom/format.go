package geom

import "strconv"

// FormatMM formats a length in nanometres as millimetres with exactly six
// decimals ("-1.234567"), in integer arithmetic: no float is involved, so
// the text is the exact value.
func FormatMM(nm int64) string {
	neg := nm < 0
	u := uint64(nm)
	if neg {
		u = uint64(-nm) // -MinInt64 wraps to itself, which uint64 reads right
	}
	frac := strconv.FormatUint(u%1e6, 10)
	b := make([]byte, 0, 24)
	if neg {
		b = append(b, '-')
	}
	b = strconv.AppendUint(b, u/1e6, 10)
	b = append(b, '.')
	for i := len(frac); i < 6; i++ {
		b = append(b, '0')
	}
	return string(append(b, frac...))
}
