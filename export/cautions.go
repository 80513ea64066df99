package export

// Cautions are the RF safety notes carried by the build summary, the
// report, the drawing and "stubcraft build --help".
func Cautions() []string {
	return []string{
		"Verify the etched board with a network analyser before connecting a transmitter: a model is not a measurement.",
		"RF power can cause burns and harmful exposure: never touch a powered line, stub or antenna, and keep to the exposure limits that apply to you.",
		"Lossy laminates heat under power (FR-4 above all): check the dissipated power and the temperature rise before running high power.",
		"Radio regulations govern what may be transmitted, on which frequencies and at what power: keep within your licence or the licence-exempt limits.",
		"Local codes and licensed engineering practice govern any product or installation; this tool's output does not replace them.",
	}
}
