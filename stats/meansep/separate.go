package meansep

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Method is a test for separating means. Its value is the name trial
// files, the JSON output and the command line use ("lsd", "tukey"); the
// zero value "" names no method.
type Method string

const (
	// LSD is Fisher's least significant difference: unadjusted t tests,
	// protected by the treatment F test (see Result.LSDLetters).
	LSD Method = "lsd"
	// Tukey is Tukey's honestly significant difference (Tukey–Kramer with
	// unequal standard errors), controlling the familywise error rate.
	Tukey Method = "tukey"
)

// ParseMethod returns the method named s ("lsd" or "tukey", any case), and
// false for any other name.
func ParseMethod(s string) (Method, bool) {
	switch m := Method(strings.ToLower(strings.TrimSpace(s))); m {
	case LSD, Tukey:
		return m, true
	}
	return "", false
}

// String returns the usual name of the method: "LSD", "Tukey HSD".
func (m Method) String() string {
	switch m {
	case LSD:
		return "LSD"
	case Tukey:
		return "Tukey HSD"
	}
	return "Method(" + strconv.Quote(string(m)) + ")"
}

// Significant returns the predicate "treatments i and j differ at level
// r.Alpha by method m", that is p < Alpha.
func (r *Result) Significant(m Method) func(i, j int) bool {
	k, alpha := r.K, r.Alpha
	if m != LSD && m != Tukey {
		panic("meansep: unknown method")
	}
	if m == LSD {
		return func(i, j int) bool {
			if i > j {
				i, j = j, i
			}
			return r.Pairs[pairIndex(k, i, j)].PLSD < alpha
		}
	}
	return func(i, j int) bool {
		if i > j {
			i, j = j, i
		}
		return r.Pairs[pairIndex(k, i, j)].PTukey < alpha
	}
}

// Lettering is a compact letter display of a Result.
type Lettering struct {
	Method Method
	// Letters has one string per treatment, in level order (see Letters
	// for the format). It is nil when Withheld.
	Letters []string
	// Withheld is true when the protected LSD gives no letters because
	// the treatment F test is not significant; Note then says so.
	Withheld bool
	Note     string
}

// percent formats a significance level as a percentage: 0.05 → "5%".
func percent(alpha float64) string {
	return strconv.FormatFloat(100*alpha, 'g', 4, 64) + "%"
}

// Protect applies the protection of Fisher's LSD (Fisher 1935, The Design
// of Experiments; common practice in field trials): pairwise LSD tests are
// made only when the treatment F test is significant, p < alpha. It
// returns true when letters may be shown, and otherwise a plain-language
// note for the report.
func Protect(fTestP, alpha float64) (ok bool, note string) {
	if fTestP < alpha {
		return true, ""
	}
	return false, fmt.Sprintf("the treatment F test is not significant at %s: no LSD letters (means do not differ detectably)", percent(alpha))
}

// LSDLetters returns the letter display of the LSD comparisons. The
// letters are protected: when fTestP (the p-value of the treatment F test)
// is not below r.Alpha they are withheld with a note, unless unprotected is
// true.
func (r *Result) LSDLetters(fTestP float64, unprotected bool, opt LetterOptions) (Lettering, error) {
	if math.IsNaN(fTestP) {
		return Lettering{}, fmt.Errorf("the treatment F test has no p-value, so LSD letters cannot be protected")
	}
	if !unprotected {
		if ok, note := Protect(fTestP, r.Alpha); !ok {
			return Lettering{Method: LSD, Withheld: true, Note: note}, nil
		}
	}
	l, err := Letters(r.Means, r.Significant(LSD), opt)
	if err != nil {
		return Lettering{}, err
	}
	return Lettering{Method: LSD, Letters: l}, nil
}

// TukeyLetters returns the letter display of the Tukey comparisons. Tukey's
// test controls the familywise error rate itself and needs no F test
// protection.
func (r *Result) TukeyLetters(opt LetterOptions) (Lettering, error) {
	l, err := Letters(r.Means, r.Significant(Tukey), opt)
	if err != nil {
		return Lettering{}, err
	}
	return Lettering{Method: Tukey, Letters: l}, nil
}
