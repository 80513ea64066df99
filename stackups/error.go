package stackups

import "stubcraft/stackups/tomlx"

// Error is a problem with one stackup: where it is (file and line), which
// key and value, and why. Line is 0 when the line is not known, Key is empty
// for a problem with the file as a whole, and Value is empty when the key is
// missing. It reads like "board.toml:7: dielectric.er = 0.8: relative
// permittivity must be at least 1". It is the shared TOML layer's error.
type Error = tomlx.Error

// Reasons carried by Error.Err, for errors.Is. Range and unit problems carry
// their own messages (units.NumError for unreadable quantities).
var (
	ErrMissing    = tomlx.ErrMissing
	ErrUnknownKey = tomlx.ErrUnknownKey
	ErrType       = tomlx.ErrType
	ErrSyntax     = tomlx.ErrSyntax
)
