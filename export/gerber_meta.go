package export

import (
	"crypto/sha1"
	"fmt"
	"strings"
	"time"
)

// Vendor is the vendor field of the generation-software attributes.
const Vendor = "stubcraft"

// Application is the application field of the generation-software
// attributes.
const Application = "stubcraft"

// Meta is what every fabrication file says about where it comes from. The
// writers never read the clock: Created is given by the caller (which takes
// SOURCE_DATE_EPOCH when set), so the same input gives the same bytes.
type Meta struct {
	// ProjectID is the project's RFC 4122 UUID. Empty: a name-based
	// (version 5) UUID is derived from ProjectName, see ProjectGUID.
	ProjectID   string
	ProjectName string
	Version     string // stubcraft's version, for GenerationSoftware
	// Revision is the project revision in ProjectId; empty means "1".
	Revision string
	Created  time.Time
	// Layers is the copper layer count of the whole board when the files
	// describe the outer layer pair of a multilayer board; 0 or 2: a
	// two-layer board.
	Layers int
}

// dnsNamespace is the RFC 4122 (appendix C) name space ID for domain
// names, 6ba7b810-9dad-11d1-80b4-00c04fd430c8, as bytes.
const dnsNamespace = "\x6b\xa7\xb8\x10\x9d\xad\x11\xd1\x80\xb4\x00\xc0\x4f\xd4\x30\xc8"

// ProjectGUID returns m.ProjectID when it is a UUID, or, when it is empty,
// the RFC 4122 version-5 UUID of the name "<ProjectName>.stubcraft" in the
// DNS name space.
func (m Meta) ProjectGUID() (string, error) {
	if m.ProjectID != "" {
		if !isUUID(m.ProjectID) {
			return "", fmt.Errorf("export: project id %q is not a UUID (8-4-4-4-12 hexadecimal digits)", m.ProjectID)
		}
		return strings.ToLower(m.ProjectID), nil
	}
	h := sha1.New()
	h.Write([]byte(dnsNamespace))
	h.Write([]byte(m.ProjectName + ".stubcraft"))
	u := h.Sum(nil)[:16]
	u[6] = u[6]&0x0f | 0x50
	u[8] = u[8]&0x3f | 0x80
	return fmt.Sprintf("%x-%x-%x-%x-%x", u[0:4], u[4:6], u[6:8], u[8:10], u[10:16]), nil
}

func isUUID(s string) bool {
	if len(s) != 36 {
		return false
	}
	for i, c := range s {
		switch i {
		case 8, 13, 18, 23:
			if c != '-' {
				return false
			}
		default:
			if !strings.ContainsRune("0123456789abcdefABCDEF", c) {
				return false
			}
		}
	}
	return true
}

func (m Meta) revision() string {
	if m.Revision == "" {
		return "1"
	}
	return m.Revision
}

func (m Meta) name() string {
	if m.ProjectName == "" {
		return "stubcraft"
	}
	return m.ProjectName
}

func (m Meta) version() string {
	if m.Version == "" {
		return "0"
	}
	return m.Version
}

// creationDate formats the time in ISO 8601 with its UTC offset, as the
// Gerber CreationDate attribute and the job file want it.
func (m Meta) creationDate() string {
	return m.Created.Format("2006-01-02T15:04:05-07:00")
}

// attrField escapes a Gerber attribute field: the reserved characters
// '%', '*', ',' and '\\', and anything outside printable ASCII, become
// \uXXXX escapes (Gerber Layer Format Specification, "String" data type).
func attrField(s string) string {
	var b strings.Builder
	for _, r := range s {
		if r < 0x20 || r > 0x7e || r == '%' || r == '*' || r == ',' || r == '\\' {
			if r > 0xffff {
				fmt.Fprintf(&b, "\\U%08X", r)
			} else {
				fmt.Fprintf(&b, "\\u%04X", r)
			}
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// commentText makes a string safe inside a G04 comment: no '*' or '%'.
func commentText(s string) string {
	return strings.Map(func(r rune) rune {
		if r < 0x20 || r > 0x7e || r == '%' || r == '*' {
			return '_'
		}
		return r
	}, s)
}
