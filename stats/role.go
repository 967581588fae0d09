package stats

import "fmt"

// Role says what a line of an analysis of variance table stands for, so that
// callers find the treatment, error or total line by meaning rather than by
// its name or its position.
type Role int

// The roles of ANOVA lines. The zero value is not a role: Fit gives every
// line one of the others.
const (
	RoleNone      Role = iota
	RoleTreatment      // the treatments compared
	RoleBlock          // complete blocks (replicates) of an RCBD
	RoleRow            // rows of a Latin square
	RoleColumn         // columns of a Latin square
	RoleNuisance       // another additive classification (neither block, row nor column)
	RoleError          // experimental error (residual)
	RoleTotal          // corrected total
	// RoleNonAdditivity is Tukey's one degree of freedom for non-additivity,
	// split off the error line when it is reported in the table.
	RoleNonAdditivity
	// RoleRemainder is what is left of the error after a split such as
	// non-additivity.
	RoleRemainder
	// RoleFactor is a main effect of one factor of a factorial treatment
	// structure; RoleInteraction an interaction of two or more factors;
	// RoleErrorStratum the error of one stratum of a split-plot or
	// strip-plot model (main-plot error, subplot error, ...).
	RoleFactor
	RoleInteraction
	RoleErrorStratum
	// RoleCovariate is the regression on a covariate in an analysis of
	// covariance (FitCovariate), one degree of freedom.
	RoleCovariate
)

var roleNames = [...]string{
	RoleNone:          "none",
	RoleTreatment:     "treatment",
	RoleBlock:         "block",
	RoleRow:           "row",
	RoleColumn:        "column",
	RoleNuisance:      "nuisance",
	RoleError:         "error",
	RoleTotal:         "total",
	RoleNonAdditivity: "non-additivity",
	RoleRemainder:     "remainder",
	RoleFactor:        "factor",
	RoleInteraction:   "interaction",
	RoleErrorStratum:  "error stratum",
	RoleCovariate:     "covariate",
}

// String is the role in lower-case words ("treatment", "error", ...).
func (r Role) String() string {
	if r >= 0 && int(r) < len(roleNames) {
		return roleNames[r]
	}
	return fmt.Sprintf("Role(%d)", int(r))
}

// IsError reports whether lines of this role are an error term that other
// lines are tested against (the error, a remainder or an error stratum).
func (r Role) IsError() bool {
	return r == RoleError || r == RoleRemainder || r == RoleErrorStratum
}

// Table is the list of lines of an analysis of variance, in the order they
// are shown.
type Table []Source

// Line returns the first line of role r, false when the table has none.
func (t Table) Line(r Role) (Source, bool) {
	for _, s := range t {
		if s.Role == r {
			return s, true
		}
	}
	return Source{}, false
}

// Lines returns every line of role r, in table order (for example the
// factor lines of a factorial model); nil when there are none.
func (t Table) Lines(r Role) []Source {
	var out []Source
	for _, s := range t {
		if s.Role == r {
			out = append(out, s)
		}
	}
	return out
}

// Treatment returns the treatment line of the table.
func (t Table) Treatment() (Source, bool) { return t.Line(RoleTreatment) }

// Error returns the experimental error line of the table.
func (t Table) Error() (Source, bool) { return t.Line(RoleError) }

// Total returns the total line of the table.
func (t Table) Total() (Source, bool) { return t.Line(RoleTotal) }

// Treatment returns the treatment line of the analysis (Fit always writes
// one; false only for an empty or hand-built ANOVA).
func (a *ANOVA) Treatment() (Source, bool) {
	if a == nil {
		return Source{}, false
	}
	return a.Sources.Treatment()
}

// Error returns the error line of the analysis.
func (a *ANOVA) Error() (Source, bool) {
	if a == nil {
		return Source{}, false
	}
	return a.Sources.Error()
}

// Total returns the total line of the analysis.
func (a *ANOVA) Total() (Source, bool) {
	if a == nil {
		return Source{}, false
	}
	return a.Sources.Total()
}

// Line returns the first line of role r of the analysis.
func (a *ANOVA) Line(r Role) (Source, bool) {
	if a == nil {
		return Source{}, false
	}
	return a.Sources.Line(r)
}

// nuisanceRole is the role Fit gives nuisance factor f of nf when the
// factor does not name one: a single factor is a block, two are the rows
// and columns of a Latin square.
func nuisanceRole(f, nf int) Role {
	switch {
	case nf == 1:
		return RoleBlock
	case nf == 2 && f == 0:
		return RoleRow
	case nf == 2 && f == 1:
		return RoleColumn
	}
	return RoleNuisance
}
