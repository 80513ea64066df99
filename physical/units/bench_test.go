package units

import "testing"

func BenchmarkParseLength(b *testing.B) {
	for b.Loop() {
		if _, err := ParseLength("0.508mm"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkParseFrequency(b *testing.B) {
	for b.Loop() {
		if _, err := ParseFrequency("2.45GHz"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkParseImpedance(b *testing.B) {
	for b.Loop() {
		if _, err := ParseImpedance("18 - j22 ohm"); err != nil {
			b.Fatal(err)
		}
	}
}
