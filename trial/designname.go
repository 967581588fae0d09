package trial

import (
	"fmt"
	"strings"
)

// DesignKinds lists the designs Furlong knows, in the order they are offered.
func DesignKinds() []DesignKind { return []DesignKind{CRD, RCBD, Latin} }

// Known reports whether k is one of DesignKinds.
func (k DesignKind) Known() bool {
	switch k {
	case CRD, RCBD, Latin:
		return true
	}
	return false
}

// ParseDesignKind reads a design kind as typed on the command line
// ("crd", "rcbd", "latin", in any case); false when it is none of them.
func ParseDesignKind(s string) (DesignKind, bool) {
	k := DesignKind(strings.ToLower(strings.TrimSpace(s)))
	return k, k.Known()
}

// CLIName is the design kind as typed on the command line and stored in a
// trial file: "crd", "rcbd" or "latin".
func (k DesignKind) CLIName() string { return string(k) }

// Name is the design's name in running text, in lower case except for
// proper names: "completely randomised design", "randomised complete block
// design", "Latin square". An unknown kind is named with its code.
func (k DesignKind) Name() string {
	switch k {
	case CRD:
		return "completely randomised design"
	case RCBD:
		return "randomised complete block design"
	case Latin:
		return "Latin square"
	}
	return fmt.Sprintf("unknown design %q", string(k))
}

// Abbrev is the short name of the design: "CRD", "RCBD", "Latin square".
func (k DesignKind) Abbrev() string {
	switch k {
	case CRD:
		return "CRD"
	case RCBD:
		return "RCBD"
	}
	return k.Name()
}

// Title is the design's name as a heading or label: "Completely randomised
// design (CRD)", "Randomised complete block design (RCBD)", "Latin square".
func (k DesignKind) Title() string {
	n := k.Name()
	if !k.Known() {
		return strings.ToUpper(n[:1]) + n[1:]
	}
	n = strings.ToUpper(n[:1]) + n[1:]
	if a := k.Abbrev(); a != k.Name() {
		n += " (" + a + ")"
	}
	return n
}

// Describe names the design with its size, for running text:
// "completely randomised design, 4 replicates", "randomised complete block
// design, 4 blocks", "5 × 5 Latin square".
func (d Design) Describe() string {
	switch d.Kind {
	case CRD:
		return fmt.Sprintf("%s, %d replicates", d.Kind.Name(), d.Reps)
	case RCBD:
		return fmt.Sprintf("%s, %d blocks", d.Kind.Name(), d.Reps)
	case Latin:
		return fmt.Sprintf("%d × %d %s", d.Reps, d.Reps, d.Kind.Name())
	}
	return d.Kind.Name()
}

// Brief names the design with its size in few characters, for a status
// line: "CRD, 4 reps", "RCBD, 4 blocks", "Latin square".
func (d Design) Brief() string {
	switch d.Kind {
	case CRD:
		return fmt.Sprintf("CRD, %d reps", d.Reps)
	case RCBD:
		return fmt.Sprintf("RCBD, %d blocks", d.Reps)
	}
	return d.Kind.Abbrev()
}
