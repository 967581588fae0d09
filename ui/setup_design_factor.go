package ui

import (
	"slices"

	"furlong/trial"
)

// offerDesigns lists the designs that fit the trial's treatment
// structure (trial.DesignKindsFor), keeping the trial's own design among
// them even when it no longer fits, so that it shows as chosen.
func (s *designTab) offerDesigns() {
	t := s.t()
	kinds := trial.DesignKindsFor(len(t.Factors))
	if t.Design.Kind.Known() && !slices.Contains(kinds, t.Design.Kind) {
		kinds = append(kinds, t.Design.Kind)
	}
	var opts []string
	for _, k := range kinds {
		if i := slices.Index(designKinds, k); i >= 0 {
			opts = append(opts, designLabels[i])
		}
	}
	if !slices.Equal(opts, s.designSel.Options) {
		s.designSel.Options = opts
		s.designSel.Refresh()
	}
}

// factorOptions are the factors as the main-plot and subplot choices
// list them: "Nitrogen (N)".
func (s *designTab) factorOptions() []string {
	t := s.t()
	out := make([]string, len(t.Factors))
	for i := range t.Factors {
		out[i] = factorLabel(&t.Factors[i])
	}
	return out
}

// loadFactorPlaces sets the main-plot and subplot choices from the
// trial's design (design order: the first factors when none is named).
func (s *designTab) loadFactorPlaces() {
	t := s.t()
	opts := s.factorOptions()
	s.mainSel.Options, s.subSel.Options = opts, opts
	order := t.Design.FactorOrder(t.Factors)
	s.mainSel.ClearSelected()
	s.subSel.ClearSelected()
	if len(order) >= 1 {
		s.mainSel.SetSelectedIndex(order[0])
	}
	if len(order) >= 2 {
		s.subSel.SetSelectedIndex(order[1])
	}
	s.mainSel.Refresh()
	s.subSel.Refresh()
}

// showFactorPlaces shows the main-plot choice for split and strip plots
// (named for the horizontal strips in a strip plot) and the subplot choice
// for a split-split plot.
func (s *designTab) showFactorPlaces(k trial.DesignKind) {
	if s.form == nil {
		return
	}
	nf := len(s.t().Factors)
	showMain := k.Restricted() && nf >= 2
	showSub := k == trial.SplitPlot && nf == 3
	s.mainItem.Text = "Main plots"
	if k == trial.StripPlot {
		s.mainItem.Text = "Horizontal strips"
	}
	// The form holds the choices only where the design has them.
	items := s.form.Items[:2:2] // design and replicates
	if showMain {
		items = append(items, s.mainItem)
	}
	if showSub {
		items = append(items, s.subItem)
	}
	s.form.Items = items
	s.form.Refresh()
}

// factorPlaces reads the main-plot and subplot choices for a design of
// kind k: the factors' keys, or "" where the design has no such place.
func (s *designTab) factorPlaces(k trial.DesignKind) (main, sub string) {
	t := s.t()
	if !k.Restricted() || len(t.Factors) < 2 {
		return "", ""
	}
	if i := s.mainSel.SelectedIndex(); i >= 0 && i < len(t.Factors) {
		main = t.Factors[i].Key
	}
	if k == trial.SplitPlot && len(t.Factors) == 3 {
		if i := s.subSel.SelectedIndex(); i >= 0 && i < len(t.Factors) {
			sub = t.Factors[i].Key
		}
	}
	// The same places as the trial's design, named or by default, are no
	// change (a change would clear the randomisation).
	now := t.Design
	if now.Kind == k && slices.Equal(trial.Design{Kind: k, MainFactor: main, SubFactor: sub}.FactorOrder(t.Factors), now.FactorOrder(t.Factors)) {
		return now.MainFactor, now.SubFactor
	}
	return main, sub
}
