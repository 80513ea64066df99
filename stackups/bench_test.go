package stackups

import (
	"bytes"
	"io"
	"strings"
	"testing"
)

func BenchmarkDecode(b *testing.B) {
	text := baseFile()
	for b.Loop() {
		if _, err := Decode(strings.NewReader(text), "board.toml"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkEncode(b *testing.B) {
	s, err := Decode(strings.NewReader(baseFile()), "board.toml")
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if err := Encode(io.Discard, s); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkPresets(b *testing.B) {
	for b.Loop() {
		if len(Presets()) == 0 {
			b.Fatal("no presets")
		}
	}
}

func BenchmarkPreset(b *testing.B) {
	for b.Loop() {
		if _, ok := Preset("fr4-1.6mm"); !ok {
			b.Fatal("no preset")
		}
	}
}

func BenchmarkFormatLength(b *testing.B) {
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		buf.WriteString(formatLength(0.508e-3))
	}
}
