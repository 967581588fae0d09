package cli

import (
	"strings"

	"furlong/trial"
)

// factorFlags collects repeated --factor values.
type factorFlags []string

func (f *factorFlags) String() string { return strings.Join(*f, "; ") }

// Set adds one --factor value.
func (f *factorFlags) Set(s string) error {
	*f = append(*f, s)
	return nil
}

// newFactorHelp is the part of 'furlong help new' about factors.
const newFactorHelp = `
Factorial trials: give each treatment factor with --factor instead of --treatments (2 or 3
factors; the treatments are then every combination, coded by their level codes joined by
"-", for example N60-V2):
  --factor "KEY=LEVEL,LEVEL,..."            for example --factor "V=V1,V2,V3"
  --factor "KEY:Factor name=LEVEL,..."      the factor's name after a colon
  a LEVEL is CODE or CODE=Level name        for example "V1=Amberline"
  a LEVEL that is a number is a rate: its code is KEY and the number (N60), its value the
  number, and a unit may follow the last level: --factor "N:Nitrogen=0,60,120 kg N/ha"
--design crd or rcbd with factors randomises all combinations together. --design split-plot
puts the factor named by --main-plot (default: the first) on main plots within each block and
the next on subplots within each main plot; a third factor goes on sub-subplots (a split-split
plot; --sub-plot KEY says which factor is on the subplots). --design strip-plot needs exactly
two factors: --main-plot KEY (default: the first) lies in horizontal strips across each block,
the other in vertical strips; each block is one field row per level of the first and one
field column per level of the second. In a split plot --plots-per-row must be 0 or a multiple
of the plots in one main plot.`

// parseFactor reads one --factor value (see newFactorHelp and
// trial.ParseFactorSpec).
func parseFactor(s string) (trial.Factor, error) {
	f, err := trial.ParseFactorSpec(s)
	if err != nil {
		return trial.Factor{}, usagef("new: --factor %q: %v", s, err)
	}
	return f, nil
}

// factorPlan reads the --factor values and the main and subplot factors
// into the trial's factors and design.
func factorPlan(o *newOptions, kind trial.DesignKind) ([]trial.Factor, trial.Design, error) {
	d := trial.Design{Kind: kind, Reps: o.reps, MainFactor: o.mainPlot, SubFactor: o.subPlot}
	if len(o.factors) == 0 {
		if o.mainPlot != "" || o.subPlot != "" {
			return nil, d, usagef("new: --main-plot and --sub-plot name factors; give the factors with --factor")
		}
		return nil, d, nil
	}
	if o.treatments != "" {
		return nil, d, usagef("new: give the treatments either as a list (--treatments) or as factors (--factor), not both")
	}
	if o.rates != "" {
		return nil, d, usagef("new: --rates is for a list of treatments; with --factor give the rates as numeric levels, for example --factor \"N=0,60,120 kg N/ha\"")
	}
	var fs []trial.Factor
	for _, s := range o.factors {
		f, err := parseFactor(s)
		if err != nil {
			return nil, d, err
		}
		fs = append(fs, f)
	}
	if err := trial.ValidateFactors(fs); err != nil {
		return nil, d, usagef("new: %v", err)
	}
	return fs, d, nil
}
