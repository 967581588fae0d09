package trialfile

import "encoding/json"

// Format is the value of the top-level "format" member of a trial file.
const Format = "furlong-trial"

// Version is the newest file format version this package reads, and the
// one it writes.
const Version = 6

// The version 3 shape (also read for versions 1 and 2, which lack the
// members marked "version 2" and "version 3"). Field order here is the
// order in the file.

type fileV1 struct {
	Format  string   `json:"format"`
	Version int      `json:"version"`
	Trial   *trialV1 `json:"trial"`
}

type trialV1 struct {
	Title         string        `json:"title"`
	Crop          string        `json:"crop"`
	Season        string        `json:"season"`
	Site          siteV1        `json:"site"`
	Investigator  string        `json:"investigator"`
	Objective     string        `json:"objective"`
	Notes         string        `json:"notes"`
	Created       *string       `json:"created"`
	Modified      *string       `json:"modified"`
	Treatments    []treatmentV1 `json:"treatments"`
	Design        designV1      `json:"design"`
	Layout        layoutV1      `json:"layout"`
	Randomization randomV1      `json:"randomization"`
	Analysis      *analysisV2   `json:"analysis"`          // version 2
	Factors       []factorV3    `json:"factors,omitempty"` // version 3
	Plots         []plotV1      `json:"plots"`
	Traits        []traitV1     `json:"traits"`
	// Operations (version 5): the log of what was done (operations.go).
	Operations []operationV5 `json:"operations,omitempty"`
	// Economics (version 6): the user's prices for the margins
	// (economics.go).
	Economics *economicsV6 `json:"economics,omitempty"`
}

type siteV1 struct {
	Name         string   `json:"name"`
	Latitude     *float64 `json:"latitude"`
	Longitude    *float64 `json:"longitude"`
	Soil         string   `json:"soil"`
	PreviousCrop string   `json:"previous_crop"`
}

type treatmentV1 struct {
	Code        string   `json:"code"`
	Name        string   `json:"name"`
	Role        string   `json:"role"`
	Description string   `json:"description"`
	Rate        *float64 `json:"rate"`
	RateUnit    string   `json:"rate_unit"`
	// Levels (version 3) holds a factorial trial's level code of every
	// factor, in the order of "factors"; absent otherwise.
	Levels []string `json:"levels,omitempty"`
}

type designV1 struct {
	Kind string `json:"kind"`
	Reps int    `json:"reps"`
	// MainFactor and SubFactor (version 3): keys of the factor on the
	// main plots (or horizontal strips) and of the subplot factor of a
	// split-split plot; absent when not set.
	MainFactor string `json:"main_factor,omitempty"`
	SubFactor  string `json:"sub_factor,omitempty"`
}

// factorV3 is one treatment factor (version 3).
type factorV3 struct {
	Key    string    `json:"key"`
	Name   string    `json:"name"`
	Levels []levelV3 `json:"levels"`
}

// levelV3 is one level of a factor (version 3).
type levelV3 struct {
	Code  string   `json:"code"`
	Name  string   `json:"name"`
	Value *float64 `json:"value"`
	Unit  string   `json:"unit,omitempty"`
}

type layoutV1 struct {
	PlotLength    float64 `json:"plot_length"`
	PlotWidth     float64 `json:"plot_width"`
	HarvestLength float64 `json:"harvest_length"`
	HarvestWidth  float64 `json:"harvest_width"`
	Alley         float64 `json:"alley"`
	PlotsPerRow   int     `json:"plots_per_row"`
	Blocks        string  `json:"blocks"`
	Numbering     string  `json:"numbering"`
	Walk          string  `json:"walk"`
	// North and Landmark (optional, any version) tie the map to the
	// ground: the map edge facing north ("top", "right", "bottom",
	// "left") and what lies along the row-1 edge. Absent when not given.
	North    string `json:"north,omitempty"`
	Landmark string `json:"landmark,omitempty"`
}

type randomV1 struct {
	// Seed is a decimal string in files Furlong writes; a JSON number is
	// accepted on reading.
	Seed   json.RawMessage `json:"seed"`
	Method string          `json:"method"`
	Done   *string         `json:"done"`
}

type plotV1 struct {
	Number    int    `json:"number"`
	Block     int    `json:"block"`
	Row       int    `json:"row"`
	Column    int    `json:"column"`
	Treatment string `json:"treatment"`
	// MainPlot, SubPlot and Strip (version 3): see trial.Plot; absent
	// when 0.
	MainPlot   int           `json:"main_plot,omitempty"`
	SubPlot    int           `json:"sub_plot,omitempty"`
	Strip      int           `json:"strip,omitempty"`
	Note       string        `json:"note,omitempty"`
	Exclusions []exclusionV1 `json:"exclusions,omitempty"`
}

type exclusionV1 struct {
	Trait  string `json:"trait"`
	Reason string `json:"reason"`
}

type traitV1 struct {
	Key          string   `json:"key"`
	Name         string   `json:"name"`
	Unit         string   `json:"unit"`
	Kind         string   `json:"kind"`
	Min          *float64 `json:"min"`
	Max          *float64 `json:"max"`
	Decimals     int      `json:"decimals"`
	Assessed     *string  `json:"assessed"`
	HigherBetter bool     `json:"higher_better"`
	// Transform (version 2) is "none", "log", "sqrt" or "arcsin"; absent
	// or "" is "none".
	Transform string `json:"transform,omitempty"`
	// PercentOfCheck (version 2): true, false, or null for the default.
	PercentOfCheck *bool `json:"percent_of_check"`
	// Values is a list aligned with plots, null for a missing value;
	// absent for a derived trait.
	Values  json.RawMessage `json:"values,omitempty"`
	Derived *derivedV1      `json:"derived,omitempty"`
	// Assessment (optional, version 3) links the trait to the other
	// assessments of its series; PreCountOf marks it as the pre-treatment
	// count of a trait or series. Absent when not set.
	Assessment *assessmentV3 `json:"assessment,omitempty"`
	PreCountOf string        `json:"pre_count_of,omitempty"`
	// Covariate (version 6): the key of the trait this one is adjusted for.
	Covariate string `json:"covariate,omitempty"`
}

// assessmentV3 is one assessment of a series over time.
type assessmentV3 struct {
	Series string `json:"series"`
	// Days and From: the day count after "treatment" or "sowing"; both
	// absent when no count was given.
	Days int    `json:"days,omitempty"`
	From string `json:"from,omitempty"`
}

// analysisV2 holds the trial's analysis settings (version 2).
type analysisV2 struct {
	// MeanSeparation is "lsd" or "tukey"; absent or "" is "lsd".
	MeanSeparation string `json:"mean_separation"`
	// Contrasts (version 4): the trial's saved planned comparisons.
	Contrasts []contrastV4 `json:"contrasts,omitempty"`
	// Response (version 6): the settings of a rate trial's response
	// analysis; absent when none was made.
	Response *responseV6 `json:"response,omitempty"`
	// ContrastAdjust (version 6): the adjustment of the saved contrasts'
	// p-values ("bonferroni", "holm", "scheffe"); absent for none.
	ContrastAdjust string `json:"contrast_adjust,omitempty"`
}

// responseV6 holds a rate trial's response settings (version 6).
type responseV6 struct {
	// LeaveOut are the treatment codes left out of the trend.
	LeaveOut []string `json:"leave_out,omitempty"`
	// PriceRatio is the price of a unit of input in units of produce
	// (response units per rate unit); absent or 0 for none.
	PriceRatio float64 `json:"price_ratio,omitempty"`
}

// contrastV4 is one saved contrast (version 4): two groups of treatment
// codes, or a coefficient per treatment.
type contrastV4 struct {
	Name         string           `json:"name"`
	First        []string         `json:"first,omitempty"`
	Second       []string         `json:"second,omitempty"`
	Coefficients []contrastTermV4 `json:"coefficients,omitempty"`
}

type contrastTermV4 struct {
	Treatment string  `json:"treatment"`
	Weight    float64 `json:"weight"`
}

type derivedV1 struct {
	Kind             string  `json:"kind"`
	WeightTrait      string  `json:"weight_trait"`
	MoistureTrait    string  `json:"moisture_trait"`
	StandardMoisture float64 `json:"standard_moisture"`
	OutputUnit       string  `json:"output_unit"`
	BushelWeightLb   float64 `json:"bushel_weight_lb"`
	// Series (optional): the assessment series of an AUDPC trait.
	Series string `json:"series,omitempty"`
}

// The version 0 shape: values stored per plot as an object keyed by trait,
// the seed a bare JSON number, fewer fields.

type fileV0 struct {
	Format  string   `json:"format"`
	Version int      `json:"version"`
	Trial   *trialV0 `json:"trial"`
}

type trialV0 struct {
	Title        string          `json:"title"`
	Crop         string          `json:"crop"`
	Season       string          `json:"season"`
	Site         string          `json:"site"`
	Investigator string          `json:"investigator"`
	Notes        string          `json:"notes"`
	Created      *string         `json:"created"`
	Treatments   []treatmentV0   `json:"treatments"`
	Design       string          `json:"design"`
	Reps         int             `json:"reps"`
	PlotLength   float64         `json:"plot_length"`
	PlotWidth    float64         `json:"plot_width"`
	PlotsPerRow  int             `json:"plots_per_row"`
	Serpentine   bool            `json:"serpentine"`
	Seed         json.RawMessage `json:"seed"`
	Randomized   *string         `json:"randomized"`
	Plots        []plotV0        `json:"plots"`
	Traits       []traitV0       `json:"traits"`
}

type treatmentV0 struct {
	Code     string   `json:"code"`
	Name     string   `json:"name"`
	Check    bool     `json:"check"`
	Rate     *float64 `json:"rate"`
	RateUnit string   `json:"rate_unit"`
}

type plotV0 struct {
	Plot      int                        `json:"plot"`
	Block     int                        `json:"block"`
	Row       int                        `json:"row"`
	Column    int                        `json:"column"`
	Treatment string                     `json:"treatment"`
	Note      string                     `json:"note"`
	Values    map[string]json.RawMessage `json:"values"`
}

type traitV0 struct {
	Key          string   `json:"key"`
	Name         string   `json:"name"`
	Unit         string   `json:"unit"`
	Kind         string   `json:"kind"`
	Min          *float64 `json:"min"`
	Max          *float64 `json:"max"`
	Decimals     int      `json:"decimals"`
	HigherBetter bool     `json:"higher_better"`
}
