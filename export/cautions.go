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
