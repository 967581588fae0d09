package trial

import (
	"fmt"
	"math"
)

// Exact unit definitions (NIST Handbook 44, Appendix C; the international
// yard and pound agreement of 1959).
const (
	// PoundKg is the mass of one avoirdupois pound in kilograms, exact.
	PoundKg = 0.45359237
	// AcreM2 is the area of one international acre in square metres, exact
	// (43 560 ft² with 1 ft = 0.3048 m).
	AcreM2 = 4046.8564224
	// HectareM2 is the area of one hectare in square metres.
	HectareM2 = 10000
)

// Output units of an adjusted-yield trait.
const (
	UnitTHa  = "t/ha"  // tonnes per hectare
	UnitBuAc = "bu/ac" // bushels per acre, using the crop's bushel weight
)

// MoistureAdjustedYield returns the yield in t/ha of a plot adjusted to a standard
// moisture:
//
//	Y = W × (100 − M) / (100 − Ms) × 10 / A
//
// with W the harvested plot weight in kg, M its moisture in %, Ms the
// standard moisture in % and A the harvested area in m² (the factor 10
// turns kg/m² into t/ha). This is the usual dry-matter-preserving
// adjustment (common practice).
//
// A missing weight or moisture gives a missing yield and no error. A
// negative weight, a moisture outside 0–<100 %, a standard moisture outside
// 0–<100 % or an area that is not positive is an error, and the yield is
// then missing.
func MoistureAdjustedYield(weightKg, moisturePct, standardMoisturePct, areaM2 float64) (float64, error) {
	switch {
	case !(standardMoisturePct >= 0 && standardMoisturePct < 100):
		return Missing, fmt.Errorf("a standard moisture of %g %% is not possible; it must be at least 0 and below 100", standardMoisturePct)
	case !(areaM2 > 0) || math.IsInf(areaM2, 0):
		return Missing, fmt.Errorf("the harvested area must be more than 0 m², not %g", areaM2)
	case IsMissing(weightKg) || IsMissing(moisturePct):
		return Missing, nil
	case weightKg < 0 || math.IsInf(weightKg, 0):
		return Missing, fmt.Errorf("a plot weight of %g kg is not possible", weightKg)
	case moisturePct < 0 || moisturePct >= 100:
		return Missing, fmt.Errorf("a grain moisture of %g %% is not possible; it must be at least 0 and below 100", moisturePct)
	}
	return weightKg * (100 - moisturePct) / (100 - standardMoisturePct) * 10 / areaM2, nil
}

// THaToBuAc converts a yield in t/ha to bushels per acre for a crop whose
// bushel weighs bushelLb pounds:
//
//	bu/ac = t/ha × 1000 / (bushelLb × PoundKg) × AcreM2 / 10000
func THaToBuAc(tha, bushelLb float64) float64 {
	return tha * 1000 / (bushelLb * PoundKg) * AcreM2 / HectareM2
}

// BuAcToTHa converts bushels per acre back to t/ha; it is the inverse of
// THaToBuAc.
func BuAcToTHa(buac, bushelLb float64) float64 {
	return buac * bushelLb * PoundKg / 1000 * HectareM2 / AcreM2
}

// HarvestedArea returns the harvested area of one plot in m²: HarvestLength
// × HarvestWidth, where a zero harvested length or width falls back to the
// plot's length or width.
func (l Layout) HarvestedArea() float64 {
	length, width := l.HarvestLength, l.HarvestWidth
	if length == 0 {
		length = l.PlotLength
	}
	if width == 0 {
		width = l.PlotWidth
	}
	return length * width
}

// AdjustedYieldTrait returns a derived trait computing moisture-adjusted
// yield from the stored traits weightKey (plot weight, kg) and moistureKey
// (grain moisture, %). The moisture basis and, for bu/ac, the bushel weight
// are taken from CropDefaults when crop is known; otherwise the standard
// moisture is 0 (dry matter) and must be set by the caller. unit is UnitTHa
// or UnitBuAc.
func AdjustedYieldTrait(key, weightKey, moistureKey, crop, unit string) Trait {
	d := &Derivation{
		Kind:          AdjustedYield,
		WeightTrait:   weightKey,
		MoistureTrait: moistureKey,
		OutputUnit:    unit,
	}
	if cd, ok := LookupCrop(crop); ok {
		d.StandardMoisture = cd.StandardMoisture
		if unit == UnitBuAc {
			d.BushelWeightLb = cd.BushelWeightLb
		}
	}
	decimals := 2
	if unit == UnitBuAc {
		decimals = 1
	}
	return Trait{
		Key:          key,
		Name:         fmt.Sprintf("Yield at %g %% moisture", d.StandardMoisture),
		Unit:         unit,
		Kind:         Continuous,
		Decimals:     decimals,
		HigherBetter: true,
		Derived:      d,
	}
}

// bushelWeight returns the bushel weight a derivation uses: its own, or the
// trial crop's default.
func (t *Trial) bushelWeight(d *Derivation) (float64, bool) {
	if d.BushelWeightLb > 0 {
		return d.BushelWeightLb, true
	}
	if cd, ok := LookupCrop(t.Crop); ok {
		return cd.BushelWeightLb, true
	}
	return 0, false
}

// derive computes a derived trait for every plot. Plots whose inputs are
// missing or impossible (see MoistureAdjustedYield) get a missing value; Validate
// reports the impossible ones.
func (t *Trial) derive(tr *Trait) ([]float64, error) {
	d := tr.Derived
	switch d.Kind {
	case AUDPC, AUDPCStandard:
		return t.deriveAUDPC(tr)
	}
	if d.Kind != AdjustedYield {
		return nil, fmt.Errorf("trait %q uses a formula this version of Furlong does not know (%q)", tr.Key, d.Kind)
	}
	w, err := t.storedValues(d.WeightTrait, tr.Key)
	if err != nil {
		return nil, err
	}
	m, err := t.storedValues(d.MoistureTrait, tr.Key)
	if err != nil {
		return nil, err
	}
	area := t.Layout.HarvestedArea()
	if _, err = MoistureAdjustedYield(0, 0, d.StandardMoisture, area); err != nil {
		return nil, fmt.Errorf("trait %q cannot be computed: %w", tr.Key, err)
	}
	toUnit := func(v float64) float64 { return v }
	switch d.OutputUnit {
	case "", UnitTHa:
	case UnitBuAc:
		lb, ok := t.bushelWeight(d)
		if !ok {
			return nil, fmt.Errorf("trait %q is in bu/ac but no bushel weight is set and crop %q has no default", tr.Key, t.Crop)
		}
		toUnit = func(v float64) float64 { return THaToBuAc(v, lb) }
	default:
		return nil, fmt.Errorf("trait %q has output unit %q; use t/ha or bu/ac", tr.Key, d.OutputUnit)
	}
	out := make([]float64, len(t.Plots))
	for i := range out {
		y, err := MoistureAdjustedYield(w[i], m[i], d.StandardMoisture, area)
		if err != nil || IsMissing(y) {
			out[i] = Missing
			continue
		}
		out[i] = toUnit(y)
	}
	return out, nil
}

// storedValues returns the values of the stored trait key, used by the
// derived trait user.
func (t *Trial) storedValues(key, user string) ([]float64, error) {
	j := t.TraitIndex(key)
	if j < 0 {
		return nil, fmt.Errorf("trait %q is computed from trait %q, which is not in the trial", user, key)
	}
	src := &t.Traits[j]
	if src.Derived != nil {
		return nil, fmt.Errorf("trait %q is computed from trait %q, which is itself computed; it needs a recorded trait", user, key)
	}
	if len(src.Values) != len(t.Plots) {
		return nil, fmt.Errorf("trait %q has %d values for %d plots", key, len(src.Values), len(t.Plots))
	}
	return src.Values, nil
}
