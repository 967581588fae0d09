package trial

import "strings"

// CropDefault holds the defaults Furlong offers for a crop's adjusted yield.
type CropDefault struct {
	// StandardMoisture is the moisture basis yields are adjusted to, %.
	StandardMoisture float64
	// BushelWeightLb is the weight of one bushel, pounds, for bu/ac.
	BushelWeightLb float64
}

// CropDefaults are the defaults offered when a trial's Crop names one of
// these crops (see LookupCrop). They are editable starting points, not
// rules: every adjusted-yield trait stores its own moisture basis and
// bushel weight.
//
// Bushel weights are the USDA standard test weights per bushel (maize
// 56 lb, soybean and wheat 60 lb, barley 48 lb, oats 32 lb).
//
// Standard moistures are common practice, not a standard: the moisture basis
// a yield is quoted at differs between markets, countries and trading
// rules. The values here (maize 15.5 %, soybean 13 %, wheat 13.5 %,
// barley 14.5 %, oats 14 %) are the defaults chosen for Furlong; change
// them on the trait when your market uses another basis.
var CropDefaults = map[string]CropDefault{
	"maize":   {StandardMoisture: 15.5, BushelWeightLb: 56},
	"soybean": {StandardMoisture: 13, BushelWeightLb: 60},
	"wheat":   {StandardMoisture: 13.5, BushelWeightLb: 60},
	"barley":  {StandardMoisture: 14.5, BushelWeightLb: 48},
	"oats":    {StandardMoisture: 14, BushelWeightLb: 32},
}

// cropAliases maps other common names to CropDefaults keys.
var cropAliases = map[string]string{
	"corn":     "maize",
	"soybeans": "soybean",
	"soya":     "soybean",
	"soy":      "soybean",
	"oat":      "oats",
}

// LookupCrop returns the defaults for a crop named in free text. The match
// ignores case and surrounding spaces and knows a few other names ("corn"
// for maize, "soybeans" or "soya" for soybean, "oat" for oats).
func LookupCrop(crop string) (CropDefault, bool) {
	key := strings.ToLower(strings.TrimSpace(crop))
	if k, ok := cropAliases[key]; ok {
		key = k
	}
	d, ok := CropDefaults[key]
	return d, ok
}
