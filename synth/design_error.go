package synth

import "stubcraft/stackups/tomlx"

// DesignError reports a fault in a design file, in the manner of
// encoding/json's errors: where (file and line), which key, the value as it
// was written, and why. It is the shared TOML layer's error.
//
//	demo.toml:4: frequency = "0Hz": the design frequency must be positive
type DesignError = tomlx.Error

// Reasons carried (wrapped) by DesignError.Err, for errors.Is.
var (
	ErrUnknownKey = tomlx.ErrUnknownKey
	ErrMissingKey = tomlx.ErrMissing
)
