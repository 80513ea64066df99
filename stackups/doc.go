// Package stackups decodes board stackups from TOML and carries the
// embedded laminate presets.
//
// A stackup file describes one signal layer over its ground: the line kind,
// the dielectric, the copper, an optional solder mask and the laminate's
// usual tolerances. Quantities with units are strings read by package units;
// pure numbers are TOML numbers:
//
//	name = "sensor-board"
//	description = "two-layer sensor board"   # optional
//	line = "microstrip"                      # or "gcpw"; default "microstrip"
//	gap = "0.25mm"                           # gcpw only: strip-to-ground gap
//
//	[dielectric]
//	er = 3.5                  # relative permittivity at er_frequency
//	er_frequency = "10GHz"    # optional
//	loss_tangent = 0.004
//	thickness = "0.51mm"
//
//	[copper]
//	thickness = "35um"        # or weight = "1oz", exactly one of the two
//	roughness = "1um"         # RMS, optional, default 0
//	conductivity = 5.8e7      # S/m, optional, default annealed copper
//
//	[mask]                    # optional solder mask over the line
//	thickness = "20um"
//	er = 3.5
//	loss_tangent = 0.02       # optional, default 0
//
//	[spread]                  # optional usual tolerances
//	er = "5%"                 # relative, or an absolute number such as 0.2
//	thickness = "10%"         # relative, or an absolute length such as "0.05mm"
//
// Decoding is strict: an unknown key (keys are case sensitive), a value of
// the wrong type, an unreadable quantity or a value out of its range is an
// *Error that names the file, the line where it is known, the key and the
// value. Inside, every length is in metres and every frequency in hertz.
//
// The presets are embedded TOML files in the same schema, named after the
// material class and thickness. Their values are typical of the class, from
// memory and not from any datasheet: check a real laminate's data before
// committing a design to it.
package stackups
