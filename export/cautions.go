package export

import "strings"

// Cautions are the warnings that go with every set of results, one sentence
// each: results of one site-year are not a recommendation, and products
// must be used as their label, local regulations and licensed advice say.
// The workbook's cover lists them; the window's Cautions dialog shows them
// as one paragraph (CautionText).
var Cautions = []string{
	"These results come from one site and one season; they are not a recommendation.",
	"Treatments that differ here may rank differently at other sites or in other years; base decisions on trials repeated over sites and seasons.",
	"Follow the product label and local regulations for any crop-protection product.",
	"Seek advice from a licensed adviser before acting on these results.",
}

// CautionShort is the one-line form of Cautions, for the foot of a screen.
const CautionShort = "One site-year is not a recommendation · follow product labels and local rules · seek licensed advice."

// CautionText is Cautions as one paragraph.
func CautionText() string { return strings.Join(Cautions, " ") }

// EconomicCautions go with every economic output (optimum rates, margins,
// returns): prices are the user's and change, one trial is not a
// recommendation, and nutrient and product rules come first.
var EconomicCautions = []string{
	"Prices change, and the optimum moves with the price ratio.",
	"The optimum from one trial is not a recommendation.",
	"Follow local nutrient-management rules and regulations, the product label, and licensed advice.",
}

// EconomicCautionText is EconomicCautions as one paragraph.
func EconomicCautionText() string { return strings.Join(EconomicCautions, " ") }

// ProtectionCautions go with every crop-protection output (percent
// efficacy, disease progress, the operations log): the label is the law,
// one trial's efficacy is not a recommendation, and local rules and
// licensed advice come first. Furlong records what was done; it never
// suggests a product or a rate.
var ProtectionCautions = []string{
	"The product label is the law: use a product only as its label and local regulations allow.",
	"Efficacy in one trial is not a recommendation of a product, rate or timing.",
	"Follow local regulations and the advice of a licensed adviser before any application.",
}

// ProtectionCautionText is ProtectionCautions as one paragraph.
func ProtectionCautionText() string { return strings.Join(ProtectionCautions, " ") }

// SeriesCautions go with every summary of a series of trials: a series
// over few sites is still limited evidence, local conditions differ, and
// the summary is not a recommendation.
var SeriesCautions = []string{
	"A series over a few sites and seasons is still limited evidence: entries can rank differently in other places and years.",
	"Local conditions (soil, weather, pests, management) differ from those of the trial sites; look at the sites most like your own.",
	"These results describe what was tested; they are not a recommendation of any entry or product.",
	"Follow the product label and local regulations for any crop-protection product, and seek advice from a licensed adviser before acting on these results.",
}

// SeriesCautionText is SeriesCautions as one paragraph.
func SeriesCautionText() string { return strings.Join(SeriesCautions, " ") }
