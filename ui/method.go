package ui

import (
	"furlong/stats/meansep"
	"furlong/trial"
)

// setMethod changes the trial's remembered mean-separation method, the one
// Compare, the Report step and `furlong report` all use; it is saved with
// the trial and undone like any edit.
type setMethod struct{ old, new string }

func (c *setMethod) do(t *trial.Trial)   { t.Analysis.Method = c.new }
func (c *setMethod) undo(t *trial.Trial) { t.Analysis.Method = c.old }
func (c *setMethod) kind() change        { return changeDetails }
func (c *setMethod) label() string       { return "mean separation " + methodLabel(meansep.Method(c.new)) }

// trialMethod is the mean-separation method of the open trial (the
// preference before a trial is open).
func (u *App) trialMethod() meansep.Method {
	if u.doc == nil {
		return u.prefs.method
	}
	return meansep.Method(u.doc.t.MeanSeparation())
}

// chooseMethod makes m the open trial's method, as an undoable edit, and
// remembers it as the preference for new trials.
func (u *App) chooseMethod(m meansep.Method) {
	u.prefs.onMethodChanged(m)
	if u.doc == nil || u.trialMethod() == m {
		return
	}
	u.doc.apply(&setMethod{old: u.doc.t.Analysis.Method, new: string(m)})
}
