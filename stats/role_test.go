package stats

import "testing"

// TestTableLines: lines are found by role, the first of a role by Line and
// all of them by Lines; a nil ANOVA has none (properties of the accessors).
func TestTableLines(t *testing.T) {
	t.Parallel()
	tab := Table{
		{Name: "N", Role: RoleFactor, DF: 2},
		{Name: "P", Role: RoleFactor, DF: 1},
		{Name: "N×P", Role: RoleInteraction, DF: 2},
		{Name: "error", Role: RoleError, DF: 12},
		{Name: "total", Role: RoleTotal, DF: 17},
	}
	if s, ok := tab.Line(RoleFactor); !ok || s.Name != "N" {
		t.Errorf("Line(RoleFactor) = %+v, %v; want the first factor", s, ok)
	}
	if got := tab.Lines(RoleFactor); len(got) != 2 || got[1].Name != "P" {
		t.Errorf("Lines(RoleFactor) = %+v", got)
	}
	if _, ok := tab.Treatment(); ok {
		t.Error("a table without a treatment line reports one")
	}
	if s, ok := tab.Error(); !ok || s.DF != 12 {
		t.Errorf("Error() = %+v, %v", s, ok)
	}
	if s, ok := tab.Total(); !ok || s.DF != 17 {
		t.Errorf("Total() = %+v, %v", s, ok)
	}
	var a *ANOVA
	if _, ok := a.Treatment(); ok {
		t.Error("nil ANOVA has a treatment line")
	}
	if !RoleErrorStratum.IsError() || RoleTreatment.IsError() {
		t.Error("IsError wrong")
	}
	if RoleTotal.String() != "total" || Role(99).String() != "Role(99)" {
		t.Errorf("String: %q %q", RoleTotal, Role(99))
	}
}

// TestFitRoles: Fit gives the treatment line RoleTreatment whatever the
// factor's name, and a nuisance factor the role it asks for.
func TestFitRoles(t *testing.T) {
	t.Parallel()
	// Two treatments in three blocks (invented numbers: the roles are the
	// property checked, not the values).
	m := Model{
		Response:  []float64{4.1, 5.0, 3.8, 5.2, 4.4, 4.9},
		Treatment: Factor{Name: "variety", Levels: 2, Index: []int{0, 1, 0, 1, 0, 1}},
		Nuisance:  []Factor{{Name: "site", Role: RoleNuisance, Levels: 3, Index: []int{0, 0, 1, 1, 2, 2}}},
	}
	a, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	want := []Role{RoleTreatment, RoleNuisance, RoleError, RoleTotal}
	for i, r := range want {
		if a.Sources[i].Role != r {
			t.Errorf("line %d (%s) role %v, want %v", i, a.Sources[i].Name, a.Sources[i].Role, r)
		}
	}
	if a.RelativeEfficiency != nil {
		t.Errorf("relative efficiency %g without a block line", *a.RelativeEfficiency)
	}
	m.Nuisance[0].Role = RoleNone
	if a, err = Fit(m); err != nil {
		t.Fatal(err)
	}
	if s, ok := a.Line(RoleBlock); !ok || s.Name != "site" {
		t.Errorf("one nuisance factor without a role is not the block line: %+v", a.Sources)
	}
}
