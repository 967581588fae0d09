package trialfile

import (
	"fmt"
	"strings"

	"furlong/trial"
)

// Bounds of the numbers in a trial file. Each is far beyond any real
// trial and small enough that no command spins or runs out of memory on
// a crafted file; Decode refuses a number outside them, naming its path.
const (
	// MaxDecimals is the most decimals a trait may be shown with.
	MaxDecimals = 10
	// MaxReps is the largest replicate count a file may hold (as many as
	// there may be blocks).
	MaxReps = MaxPosition
	// MaxPosition is the largest block, field row, field column or
	// plots-per-row count.
	MaxPosition = 100000
	// MaxPlotNumber is the largest plot number (what a 32-bit whole number
	// and every spreadsheet hold exactly).
	MaxPlotNumber = 1<<31 - 1
	// MaxLength is the largest plot, harvest or alley length in metres.
	MaxLength = 10000
	// gridSlack: the field grid (rows × columns the plots span) may exceed
	// the number of plots by this factor plus gridExtra cells; the layouts
	// Furlong makes stay under twice the plots.
	gridSlack = 4
	gridExtra = 10000
)

func designList() string {
	var names []string
	for _, d := range trial.DesignKinds() {
		names = append(names, fmt.Sprintf("%q", string(d)))
	}
	return strings.Join(names, ", ")
}

// checkBounds finds the first number of t outside what its field can hold
// and a design kind Furlong does not know.
func checkBounds(t *trial.Trial) *problem {
	d := t.Design
	switch {
	case d.Kind == "" && len(t.Plots) > 0:
		return &problem{"trial.design.kind", errorf(ErrUnknownDesign, "the file does not say which design the trial has (one of %s); it cannot be analysed without one", designList())}
	case d.Kind != "" && !d.Kind.Known():
		return &problem{"trial.design.kind", errorf(ErrUnknownDesign, "the design kind %q is not one Furlong knows (%s): the file may come from a newer Furlong, or be damaged", string(d.Kind), designList())}
	case d.Reps < 0 || d.Reps > MaxReps:
		return &problem{"trial.design.reps", errorf(ErrOutOfRange, "the number of replicates must be from 0 to %d, not %d", MaxReps, d.Reps)}
	}
	if p := checkFactorBounds(t); p != nil {
		return p
	}
	l := t.Layout
	if l.PlotsPerRow < 0 || l.PlotsPerRow > MaxPosition {
		return &problem{"trial.layout.plots_per_row", errorf(ErrOutOfRange, "the plots per field row must be from 0 (each block in one row) to %d, not %d", MaxPosition, l.PlotsPerRow)}
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"plot_length", l.PlotLength}, {"plot_width", l.PlotWidth}, {"harvest_length", l.HarvestLength}, {"harvest_width", l.HarvestWidth}, {"alley", l.Alley}} {
		if f.v < 0 || f.v > MaxLength {
			return &problem{"trial.layout." + f.name, errorf(ErrOutOfRange, "the layout's %s must be from 0 to %d m, not %s m", strings.ReplaceAll(f.name, "_", " "), MaxLength, fmtNum(f.v))}
		}
	}
	for _, f := range []struct {
		name  string
		v     *float64
		limit float64
	}{{"latitude", t.Site.Latitude, 90}, {"longitude", t.Site.Longitude, 180}} {
		if f.v != nil && (*f.v < -f.limit || *f.v > f.limit) {
			return &problem{"trial.site." + f.name, errorf(ErrOutOfRange, "the site's %s must be from −%g to %g degrees, not %s", f.name, f.limit, f.limit, fmtNum(*f.v))}
		}
	}
	minR, maxR, minC, maxC := 0, 0, 0, 0
	for i, p := range t.Plots {
		path := fmt.Sprintf("trial.plots[%d].", i)
		switch {
		case p.Number < 0 || p.Number > MaxPlotNumber:
			return &problem{path + "number", errorf(ErrOutOfRange, "plot number %d is outside 0 to %d", p.Number, MaxPlotNumber)}
		case p.Block < 1 || p.Block > MaxPosition:
			return &problem{path + "block", errorf(ErrOutOfRange, "plot %d is in block %d; blocks are numbered from 1 to at most %d", p.Number, p.Block, MaxPosition)}
		case p.Row < 1 || p.Row > MaxPosition:
			return &problem{path + "row", errorf(ErrOutOfRange, "plot %d is in field row %d; rows are numbered from 1 to at most %d", p.Number, p.Row, MaxPosition)}
		case p.Column < 1 || p.Column > MaxPosition:
			return &problem{path + "column", errorf(ErrOutOfRange, "plot %d is in field column %d; columns are numbered from 1 to at most %d", p.Number, p.Column, MaxPosition)}
		}
		if i == 0 {
			minR, maxR, minC, maxC = p.Row, p.Row, p.Column, p.Column
		}
		minR, maxR, minC, maxC = min(minR, p.Row), max(maxR, p.Row), min(minC, p.Column), max(maxC, p.Column)
		if area := (maxR - minR + 1) * (maxC - minC + 1); area > gridSlack*len(t.Plots)+gridExtra {
			return &problem{path + "row", errorf(ErrOutOfRange, "plot %d at field row %d, column %d makes the field %d rows by %d columns for %d plots; the plot positions look damaged",
				p.Number, p.Row, p.Column, maxR-minR+1, maxC-minC+1, len(t.Plots))}
		}
	}
	for j, tr := range t.Traits {
		path := fmt.Sprintf("trial.traits[%d].", j)
		if tr.Decimals < 0 || tr.Decimals > MaxDecimals {
			return &problem{path + "decimals", errorf(ErrOutOfRange, "trait %q is shown with %d decimals; use 0 to %d", tr.Key, tr.Decimals, MaxDecimals)}
		}
		switch tr.Kind {
		case "", trial.Continuous, trial.Count, trial.Percent, trial.Score:
		default:
			return &problem{path + "kind", errorf(ErrWrongType, "trait %q is of kind %q, which Furlong does not know (continuous, count, percent or score)", tr.Key, string(tr.Kind))}
		}
		if dv := tr.Derived; dv != nil && (dv.Kind == trial.AUDPC || dv.Kind == trial.AUDPCStandard) {
			if _, err := t.Series(dv.Series); err != nil {
				return &problem{path + "derived.series", errorf(ErrUnknownTrait, "trait %q cannot be computed: %v", tr.Key, err)}
			}
		} else if dv != nil {
			if dv.Kind != trial.AdjustedYield {
				return &problem{path + "derived.kind", errorf(ErrWrongType, "trait %q is computed by the formula %q, which Furlong does not know (%q, %q or %q)", tr.Key, string(dv.Kind), string(trial.AdjustedYield), string(trial.AUDPC), string(trial.AUDPCStandard))}
			}
			for _, src := range []struct{ name, key string }{{"weight_trait", dv.WeightTrait}, {"moisture_trait", dv.MoistureTrait}} {
				if st := t.Trait(src.key); st == nil || st.Derived != nil {
					return &problem{path + "derived." + src.name, errorf(ErrUnknownTrait, "trait %q is computed from trait %q, which the trial does not record", tr.Key, src.key)}
				}
			}
			if !(dv.StandardMoisture >= 0 && dv.StandardMoisture < 100) {
				return &problem{path + "derived.standard_moisture", errorf(ErrOutOfRange, "the standard moisture of trait %q must be from 0 %% to below 100 %%, not %s %%", tr.Key, fmtNum(dv.StandardMoisture))}
			}
			if !(dv.BushelWeightLb >= 0 && dv.BushelWeightLb <= 1000) {
				return &problem{path + "derived.bushel_weight_lb", errorf(ErrOutOfRange, "the bushel weight of trait %q must be from 0 to 1000 lb, not %s", tr.Key, fmtNum(dv.BushelWeightLb))}
			}
		}
	}
	return nil
}
