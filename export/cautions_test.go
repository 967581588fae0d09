package export

import (
	"strings"
	"testing"
)

// TestCautions: the cautions name every topic the project requires where
// output can hurt someone (a project requirement, not an outside fact): one
// site-year is not a recommendation, the product label and local
// regulations, licensed advice. The topics are literal phrases so the test
// fails if the wording loses one.
func TestCautions(t *testing.T) {
	t.Parallel()
	long := strings.ToLower(CautionText())
	for _, want := range []string{"one site and one season", "not a recommendation", "product label", "local regulations", "licensed adviser"} {
		if !strings.Contains(long, want) {
			t.Errorf("cautions lack %q: %s", want, long)
		}
	}
	short := strings.ToLower(CautionShort)
	for _, want := range []string{"one site-year", "not a recommendation", "product label", "local rules", "licensed advice"} {
		if !strings.Contains(short, want) {
			t.Errorf("short caution lacks %q: %s", want, short)
		}
	}
}
