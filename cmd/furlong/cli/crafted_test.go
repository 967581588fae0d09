package cli

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCraftedFiles runs show, map and analyze on trial files edited by
// hand into impossible shapes. Each must stop with exit 1 and a message
// naming the place, never crash (exit 3) or hang; these files once made
// show and map spin forever, analyze exhaust memory or panic (common
// practice: a reader bounds what it reads).
func TestCraftedFiles(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	tf := filepath.Join(dir, "ok.furlong")
	if code, _, stderr := run(t, "new", "-o", tf, "--treatments", "3", "--reps", "2", "--seed", "5", "--traits", "ht:cm"); code != 0 {
		t.Fatal(stderr)
	}
	good, err := os.ReadFile(tf)
	if err != nil {
		t.Fatal(err)
	}
	text := string(good)
	replaceFirst := func(old, new string) string {
		if !strings.Contains(text, old) {
			t.Fatalf("the new trial has no %q", old)
		}
		return strings.Replace(text, old, new, 1)
	}
	cases := []struct {
		name, file, want string
	}{
		{"row far away", replaceFirst(`"row": 1,`, `"row": 100000000000,`), "trial.plots[0].row"},
		{"block 0", replaceFirst(`"block": 1,`, `"block": 0,`), "trial.plots[0].block"},
		{"decimals", replaceFirst(`"decimals": 2,`, `"decimals": 10000000,`), "trial.traits[0].decimals"},
		{"unknown design", replaceFirst(`"kind": "rcbd"`, `"kind": "xyz"`), `the design kind "xyz" is not one Furlong knows`},
		{"duplicate member", replaceFirst(`"title": "`, `"title": "a", "title": "`), `"title" appears twice`},
	}
	for _, c := range cases {
		path := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".furlong")
		if err := os.WriteFile(path, []byte(c.file), 0o644); err != nil {
			t.Fatal(err)
		}
		for _, args := range [][]string{
			{"show", path},
			{"map", path, "-o", filepath.Join(dir, "map.pdf")},
			{"analyze", path},
		} {
			code, _, stderr := run(t, args...)
			if code != ExitFailure || !strings.Contains(stderr, c.want) || strings.Contains(stderr, "goroutine") {
				t.Errorf("%s: %s: exit %d, stderr %q; want exit 1 naming %q", c.name, args[0], code, stderr, c.want)
			}
		}
	}
}
