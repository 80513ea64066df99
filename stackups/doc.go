// Package stackups decodes board stackups from TOML and carries the
// embedded laminate presets.
package stackups
