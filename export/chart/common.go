package chart

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
)

// ErrNoData is returned when there is nothing to chart yet, for example a
// trait with no recorded values.
var ErrNoData = errors.New("there are no values to chart yet")

// ErrNoLayout is returned for a field chart of a trial whose plots have no
// field row and column.
var ErrNoLayout = errors.New("the plots have no field rows and columns yet; lay out the trial first")

// Order is the order of treatments along a chart's axis.
type Order int

const (
	// ByMean puts the best treatment first: the highest mean first when a
	// higher value is better, the lowest first otherwise.
	ByMean Order = iota
	// ByCode sorts treatment codes, numbers within codes by value
	// ("T2" before "T10").
	ByCode
	// AsListed keeps the trial's treatment order.
	AsListed
)

// String names the order in plain words.
func (o Order) String() string {
	switch o {
	case ByMean:
		return "by mean"
	case ByCode:
		return "by code"
	case AsListed:
		return "as listed"
	}
	return "Order(" + strconv.Itoa(int(o)) + ")"
}

// lessCode compares treatment codes with runs of digits compared as
// numbers.
func lessCode(a, b string) bool {
	for a != "" && b != "" {
		ra, rb := rune(a[0]), rune(b[0])
		if unicode.IsDigit(ra) && unicode.IsDigit(rb) {
			da, db := digitRun(a), digitRun(b)
			na, nb := strings.TrimLeft(a[:da], "0"), strings.TrimLeft(b[:db], "0")
			if len(na) != len(nb) {
				return len(na) < len(nb)
			}
			if na != nb {
				return na < nb
			}
			if da != db {
				return da < db
			}
			a, b = a[da:], b[db:]
			continue
		}
		if ra != rb {
			return ra < rb
		}
		a, b = a[1:], b[1:]
	}
	return len(a) < len(b)
}

func digitRun(s string) int {
	i := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
	}
	return i
}

// orderIndices returns the order in which to show n items with the given
// codes and means (NaN means last).
func orderIndices(o Order, codes []string, means []float64, higherBetter bool) []int {
	idx := make([]int, len(codes))
	for i := range idx {
		idx[i] = i
	}
	switch o {
	case ByCode:
		sort.SliceStable(idx, func(i, j int) bool { return lessCode(codes[idx[i]], codes[idx[j]]) })
	case ByMean:
		sort.SliceStable(idx, func(i, j int) bool {
			a, b := means[idx[i]], means[idx[j]]
			switch {
			case math.IsNaN(a):
				return false
			case math.IsNaN(b):
				return true
			case higherBetter:
				return a > b
			default:
				return a < b
			}
		})
	}
	return idx
}

// orderNote describes the order for an axis title.
func orderNote(o Order, higherBetter bool) string {
	switch o {
	case ByMean:
		if higherBetter {
			return "ordered by mean, highest first"
		}
		return "ordered by mean, lowest first"
	case ByCode:
		return "ordered by code"
	}
	return "in trial order"
}

// traitTitle is "Name (unit)", or the name alone.
func traitTitle(name, unit, key string) string {
	if name == "" {
		name = key
	}
	if unit == "" {
		return name
	}
	return name + " (" + unit + ")"
}

// formatValue prints v with the given number of decimals (−1: %g).
func formatValue(v float64, decimals int) string {
	if decimals < 0 {
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	return strconv.FormatFloat(v, 'f', decimals, 64)
}

// chartTitle joins the non-empty lines.
func chartTitle(lines ...string) string {
	var out []string
	for _, l := range lines {
		if l = strings.TrimSpace(l); l != "" {
			out = append(out, l)
		}
	}
	return strings.Join(out, "\n")
}

// traitOf finds the trait, with a plain error when it is not in the trial.
func traitOf(t *trial.Trial, key string) (*trial.Trait, error) {
	for j := range t.Traits {
		if t.Traits[j].Key == key {
			return &t.Traits[j], nil
		}
	}
	return nil, fmt.Errorf("the trial has no trait %q", key)
}

// excludedFor reports whether plot i is left out of the analysis of the
// trait key.
func excludedFor(t *trial.Trial, i int, key string) bool {
	ex, _ := t.Excluded(i, key)
	return ex
}

// Font sizes of every chart, in points. At the window's scale (96 dots per
// inch) 9 points are 12 pixels, close to the window's own text.
const (
	titleSize = 12
	labelSize = 10.5
	tickSize  = 9
	keySize   = vg.Length(9) // side panel and outlier labels
)

// newPlot returns a plot with Furlong's defaults: the sans-serif Face for
// every text, at the sizes above.
func newPlot(title string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.Padding = vg.Points(6)
	p.Title.TextStyle.Font = font.From(Face, titleSize)
	p.X.Label.TextStyle.Font = font.From(Face, labelSize)
	p.Y.Label.TextStyle.Font = font.From(Face, labelSize)
	p.X.Tick.Label.Font = font.From(Face, tickSize)
	p.Y.Tick.Label.Font = font.From(Face, tickSize)
	p.Legend.TextStyle.Font = font.From(Face, keySize)
	return p
}

// nominalAxis labels integer positions 0..n−1 of the X axis with names,
// rotating and shrinking the labels when there are many.
func nominalAxis(p *plot.Plot, names []string) {
	p.NominalX(names...)
	n := len(names)
	p.X.Min, p.X.Max = -0.6, float64(n)-0.4
	size := vg.Length(tickSize)
	longest := 0
	for _, s := range names {
		longest = max(longest, len([]rune(s)))
	}
	switch {
	case n > 150:
		size = vg.Points(3)
	case n > 80:
		size = vg.Points(4)
	case n > 40:
		size = vg.Points(6)
	case n > 20:
		size = vg.Points(6.5)
	}
	p.X.Tick.Label.Font.Size = size
	// Upright labels need about a character's width each side to stay
	// apart at the smallest chart the window shows (500 px).
	if n > 12 || n*(longest+1) > 48 {
		p.X.Tick.Label.Rotation = math.Pi / 2
		p.X.Tick.Label.XAlign = draw.XRight
		p.X.Tick.Label.YAlign = draw.YCenter
	}
}

// integerTicks labels the integers from 1 to n, at most about 25 of them.
func integerTicks(n int) plot.ConstantTicks {
	step := 1
	for n/step > 25 {
		switch {
		case step == 1:
			step = 2
		case step == 2:
			step = 5
		default:
			step *= 2
		}
	}
	var ts plot.ConstantTicks
	for i := 1; i <= n; i++ {
		label := ""
		if i == 1 || i%step == 0 {
			label = strconv.Itoa(i)
		}
		ts = append(ts, plot.Tick{Value: float64(i), Label: label})
	}
	return ts
}

func itoa(n int) string { return strconv.Itoa(n) }
