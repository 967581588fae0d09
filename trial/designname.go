package trial

import (
	"fmt"
	"strings"
)

// DesignKinds lists the designs Furlong knows, in the order they are offered.
func DesignKinds() []DesignKind { return []DesignKind{CRD, RCBD, Latin, SplitPlot, StripPlot} }

// DesignKindsFor lists the designs that fit a treatment structure of
// nFactors crossed factors (0: one list of treatments), in the order they
// are offered: one list CRD, RCBD and Latin square; 2 factors CRD, RCBD,
// split plot and strip plot; 1 or 3 factors CRD, RCBD and split plot (3
// factors: split-split plot; 1 factor: none, a split plot needs two).
func DesignKindsFor(nFactors int) []DesignKind {
	switch {
	case nFactors == 0:
		return []DesignKind{CRD, RCBD, Latin}
	case nFactors == 2:
		return []DesignKind{CRD, RCBD, SplitPlot, StripPlot}
	case nFactors == 3:
		return []DesignKind{CRD, RCBD, SplitPlot}
	}
	return []DesignKind{CRD, RCBD}
}

// Known reports whether k is one of DesignKinds.
func (k DesignKind) Known() bool {
	switch k {
	case CRD, RCBD, Latin, SplitPlot, StripPlot:
		return true
	}
	return false
}

// Restricted reports whether the design restricts the randomisation of
// its factors to main plots or strips (a split or strip plot).
func (k DesignKind) Restricted() bool { return k == SplitPlot || k == StripPlot }

// Names of the designs in output (the "design" of the analysis JSON): a
// factorial CRD or RCBD is the CRD or RCBD of a trial with factors.
const (
	DesignNameFactorialCRD  = "factorial-crd"
	DesignNameFactorialRCBD = "factorial-rcbd"
)

// DesignName is the name of a design in output: "crd", "rcbd", "latin",
// "split-plot", "strip-plot", and for a CRD or RCBD of factor
// combinations (factorial) "factorial-crd" or "factorial-rcbd".
func DesignName(k DesignKind, factorial bool) string {
	if factorial {
		switch k {
		case CRD:
			return DesignNameFactorialCRD
		case RCBD:
			return DesignNameFactorialRCBD
		}
	}
	return string(k)
}

// DesignName is the name of the trial's design in output (see the
// function DesignName).
func (t *Trial) DesignName() string { return DesignName(t.Design.Kind, t.Factorial()) }

// ParseDesignName reads a name DesignName gives (in any case) and
// returns the design kind and whether it is a factorial; ok is false for
// an unknown name.
func ParseDesignName(s string) (k DesignKind, factorial, ok bool) {
	switch n := strings.ToLower(strings.TrimSpace(s)); n {
	case DesignNameFactorialCRD:
		return CRD, true, true
	case DesignNameFactorialRCBD:
		return RCBD, true, true
	case string(SplitPlot), string(StripPlot):
		return DesignKind(n), true, true
	}
	k, ok = ParseDesignKind(s)
	return k, false, ok
}

// ParseDesignKind reads a design kind as typed on the command line
// ("crd", "rcbd", "latin", "split-plot", "strip-plot", in any case);
// false when it is none of them.
func ParseDesignKind(s string) (DesignKind, bool) {
	k := DesignKind(strings.ToLower(strings.TrimSpace(s)))
	return k, k.Known()
}

// CLIName is the design kind as typed on the command line and stored in a
// trial file: "crd", "rcbd", "latin", "split-plot" or "strip-plot".
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
	case SplitPlot:
		return "split plot"
	case StripPlot:
		return "strip plot"
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
	case SplitPlot, StripPlot:
		return fmt.Sprintf("%s in randomised complete blocks, %d blocks", d.Kind.Name(), d.Reps)
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
	case SplitPlot:
		return fmt.Sprintf("Split plot, %d blocks", d.Reps)
	case StripPlot:
		return fmt.Sprintf("Strip plot, %d blocks", d.Reps)
	}
	return d.Kind.Abbrev()
}
