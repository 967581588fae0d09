package trial

import (
	"math"
	"math/big"
	"testing"
)

func near(got, want, relTol float64) bool {
	if got == want {
		return true
	}
	return math.Abs(got-want) <= relTol*math.Abs(want)
}

// rat parses an exact decimal.
func rat(t *testing.T, s string) *big.Rat {
	t.Helper()
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		t.Fatalf("bad rational %q", s)
	}
	return r
}

func TestUnitDefinitions(t *testing.T) {
	t.Parallel()
	// NIST Handbook 44, Appendix C: 1 lb = 0.453 592 37 kg exactly;
	// 1 ft = 0.3048 m exactly and 1 acre = 43 560 ft², so
	// 1 acre = 43 560 × 0.3048² m² = 4046.856 4224 m² exactly.
	if PoundKg != 0.45359237 {
		t.Errorf("PoundKg = %v", PoundKg)
	}
	acre := new(big.Rat).Mul(big.NewRat(43560, 1), new(big.Rat).Mul(rat(t, "0.3048"), rat(t, "0.3048")))
	if acre.Cmp(rat(t, "4046.8564224")) != 0 {
		t.Fatalf("43560 ft² = %s m²", acre.FloatString(10))
	}
	if f, _ := acre.Float64(); AcreM2 != f {
		t.Errorf("AcreM2 = %v, want %v", AcreM2, f)
	}
}

// TestMoistureAdjustedYieldByHand: hand-worked cases of the usual moisture
// adjustment W·(100 − M)/(100 − Mstd), a dry-matter balance, converted to
// t/ha as kg/m² × 10 (common practice).
func TestMoistureAdjustedYieldByHand(t *testing.T) {
	t.Parallel()
	cases := []struct {
		w, m, ms, area float64
		want           float64
	}{
		// 12.5 kg at 18 % moisture, adjusted to 15.5 %, from 8 m × 1.5 m = 12 m²:
		// 12.5 × (100 − 18)/(100 − 15.5) = 12.5 × 82/84.5 = 12.130 18 kg,
		// × 10 / 12 = 10.108 48 t/ha; exactly 10250/1014 = 5125/507.
		{12.5, 18, 15.5, 12, 5125.0 / 507},
		// No moisture change: 6 kg at 13 % to 13 %, 10 m × 1.5 m = 15 m²:
		// 6 × 10 / 15 = 4 t/ha.
		{6, 13, 13, 15, 4},
		// Dry-matter basis: 5 kg at 20 % to 0 %, 10 m²: 5 × 0.8 × 10/10 = 4 t/ha.
		{5, 20, 0, 10, 4},
		// Wetter basis raises the yield: 9 kg at 12 % to 14.5 %, 12 m²:
		// 9 × 88/85.5 × 10/12 = 9 × 1.029 24 × 0.8333 = 7.719 30 t/ha
		// (exactly 7920/1026 = 1320/171).
		{9, 12, 14.5, 12, 1320.0 / 171},
	}
	for _, c := range cases {
		got, err := MoistureAdjustedYield(c.w, c.m, c.ms, c.area)
		if err != nil || !near(got, c.want, 1e-14) {
			t.Errorf("MoistureAdjustedYield(%g, %g, %g, %g) = %.12g, %v; want %.12g", c.w, c.m, c.ms, c.area, got, err, c.want)
		}
	}
}

func TestMoistureAdjustedYieldMissingAndImpossible(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		w, m, ms, area float64
		wantErr        bool
	}{
		{Missing, 18, 15.5, 12, false},
		{12, Missing, 15.5, 12, false},
		{-1, 18, 15.5, 12, true},
		{12, 100, 15.5, 12, true},
		{12, -0.5, 15.5, 12, true},
		{12, 18, 100, 12, true},
		{12, 18, 15.5, 0, true},
		{Missing, Missing, 15.5, 0, true}, // a bad area is reported even for missing inputs
	} {
		got, err := MoistureAdjustedYield(c.w, c.m, c.ms, c.area)
		if !IsMissing(got) || (err != nil) != c.wantErr {
			t.Errorf("MoistureAdjustedYield(%g, %g, %g, %g) = %g, %v; want missing, error %v", c.w, c.m, c.ms, c.area, got, err, c.wantErr)
		}
	}
}

func TestBushelConversion(t *testing.T) {
	t.Parallel()
	// Exact: bu/ac = t/ha × 1000 / (lb × 0.45359237) × 4046.8564224 / 10000,
	// evaluated in rational arithmetic.
	exact := func(tha float64, lb int64) float64 {
		r := new(big.Rat).SetFloat64(tha)
		r.Mul(r, big.NewRat(1000, 1))
		r.Quo(r, new(big.Rat).Mul(big.NewRat(lb, 1), rat(t, "0.45359237")))
		r.Mul(r, rat(t, "4046.8564224"))
		r.Quo(r, big.NewRat(10000, 1))
		f, _ := r.Float64()
		return f
	}
	for _, lb := range []int64{56, 60, 48, 32} {
		for _, tha := range []float64{1, 3.25, 10.108481262327416} {
			if got, want := THaToBuAc(tha, float64(lb)), exact(tha, lb); !near(got, want, 1e-15) {
				t.Errorf("THaToBuAc(%g, %d) = %.17g, want %.17g", tha, lb, got, want)
			}
			if back := BuAcToTHa(THaToBuAc(tha, float64(lb)), float64(lb)); !near(back, tha, 1e-15) {
				t.Errorf("round trip %g t/ha at %d lb gives %.17g", tha, lb, back)
			}
		}
	}
	// Extension conversion tables (from memory): 1 bu/ac is 62.77 kg/ha of
	// maize (56 lb), 67.25 kg/ha of wheat or soybean (60 lb), 53.80 kg/ha of
	// barley (48 lb) and 35.87 kg/ha of oats (32 lb); 1 t/ha of maize is
	// 15.93 bu/ac. Hand check for maize: 56 × 0.45359237 = 25.401 172 72 kg
	// per bushel, / 0.404 685 642 24 ha per acre = 62.767 kg/ha.
	for _, c := range []struct {
		lb, kgha float64
	}{{56, 62.77}, {60, 67.25}, {48, 53.80}, {32, 35.87}} {
		if got := BuAcToTHa(1, c.lb) * 1000; math.Abs(got-c.kgha) > 0.005 {
			t.Errorf("1 bu/ac at %g lb = %.4f kg/ha, want %.2f", c.lb, got, c.kgha)
		}
	}
	if got := THaToBuAc(1, 56); math.Abs(got-15.93) > 0.005 {
		t.Errorf("1 t/ha maize = %.4f bu/ac, want 15.93", got)
	}
}

func TestCropDefaults(t *testing.T) {
	t.Parallel()
	// USDA standard bushel weights (maize 56 lb, soybean 60, wheat 60,
	// barley 48, oats 32; from memory); standard moistures are common
	// practice defaults.
	want := map[string]CropDefault{
		"maize":   {15.5, 56},
		"soybean": {13, 60},
		"wheat":   {13.5, 60},
		"barley":  {14.5, 48},
		"oats":    {14, 32},
	}
	for k, w := range want {
		if got := CropDefaults[k]; got != w {
			t.Errorf("CropDefaults[%q] = %+v, want %+v", k, got, w)
		}
	}
	for name, key := range map[string]string{" Maize ": "maize", "CORN": "maize", "Soybeans": "soybean", "oat": "oats"} {
		got, ok := LookupCrop(name)
		if !ok || got != CropDefaults[key] {
			t.Errorf("LookupCrop(%q) = %+v, %v", name, got, ok)
		}
	}
	if _, ok := LookupCrop("sorghum"); ok {
		t.Error(`LookupCrop("sorghum") found defaults`)
	}
}

// TestHarvestedArea: the default plot (10 m × 1.5 m, 8 m harvested) is the
// package's own documented DefaultLayout, not an outside fact; the check is
// the arithmetic length × width.
func TestHarvestedArea(t *testing.T) {
	t.Parallel()
	l := DefaultLayout()
	if got := l.HarvestedArea(); got != 12 { // 8 m × 1.5 m
		t.Errorf("default harvested area = %g, want 12", got)
	}
	l.HarvestLength = 0 // whole plot length: 10 m × 1.5 m
	if got := l.HarvestedArea(); got != 15 {
		t.Errorf("harvested area with length 0 = %g, want 15", got)
	}
}

func TestTraitValuesDerived(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t) // maize, harvested 12 m², standard moisture 15.5 %
	set := func(i int, key string, v float64) {
		t.Helper()
		if err := tr.SetValue(i, key, v); err != nil {
			t.Fatal(err)
		}
	}
	set(0, "wt", 12.5)
	set(0, "mst", 18)
	set(1, "wt", 12.5) // moisture missing
	set(2, "mst", 18)  // weight missing
	y, err := tr.TraitValues("yld")
	if err != nil {
		t.Fatal(err)
	}
	if len(y) != len(tr.Plots) {
		t.Fatalf("%d values for %d plots", len(y), len(tr.Plots))
	}
	if !near(y[0], 5125.0/507, 1e-14) { // hand-worked above: 10.108 48 t/ha
		t.Errorf("plot 1 yield = %.12g t/ha, want %.12g", y[0], 5125.0/507)
	}
	for i := 1; i < len(y); i++ {
		if !IsMissing(y[i]) {
			t.Errorf("plot %d yield = %g, want missing", i+1, y[i])
		}
	}
	// bu/ac from the maize default of 56 lb.
	tr.Traits[3].Derived.OutputUnit = UnitBuAc
	yb, err := tr.TraitValues("yld")
	if err != nil {
		t.Fatal(err)
	}
	if want := THaToBuAc(5125.0/507, 56); !near(yb[0], want, 1e-15) {
		t.Errorf("plot 1 yield = %.12g bu/ac, want %.12g", yb[0], want)
	}
	// Impossible moisture (the trait's range is widened to let it in) gives
	// a missing yield.
	tr.Traits[1].Max, tr.Traits[1].Kind = nil, Continuous
	set(0, "mst", 100)
	yb, _ = tr.TraitValues("yld")
	if !IsMissing(yb[0]) {
		t.Errorf("yield at 100 %% moisture = %g, want missing", yb[0])
	}
	// No harvested area: an error, not a column of NaN.
	tr.Layout.PlotLength, tr.Layout.HarvestLength = 0, 0
	if _, err := tr.TraitValues("yld"); err == nil {
		t.Error("yield with no harvested area: no error")
	}
}

// TestAdjustedYieldTrait: wheat's defaults as in TestCropDefaults (60 lb
// bushel, USDA, from memory; 13.5 % moisture, common practice).
func TestAdjustedYieldTrait(t *testing.T) {
	t.Parallel()
	tr := AdjustedYieldTrait("yld", "wt", "mst", "wheat", UnitBuAc)
	d := tr.Derived
	if d == nil || d.StandardMoisture != 13.5 || d.BushelWeightLb != 60 || d.WeightTrait != "wt" || d.MoistureTrait != "mst" || tr.Unit != UnitBuAc {
		t.Errorf("AdjustedYieldTrait = %+v, %+v", tr, d)
	}
	if err := CheckTraitKey(tr.Key); err != nil {
		t.Error(err)
	}
}
