// Package fieldmap is a Fyne widget that draws a trial's field plan: one
// rectangle per plot at its field row and column, labelled with the plot
// number and treatment code, coloured from the Okabe–Ito palette, with the
// blocks (and the main plots of a split plot) outlined. Row 1 is at the bottom and column 1 at the left, as on
// the printed map, the heat maps and the workbook; a north arrow and a
// landmark along the bottom edge tie it to the ground when the caller
// gives them. Hovering or tapping a plot reports it to the caller.
//
// The widget knows nothing of trials: the caller passes plain Plot values.
package fieldmap

import (
	"image/color"
	"math"
	"strconv"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/driver/desktop"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"
)

// OkabeIto is the colour-blind-safe palette of Okabe and Ito (2008), "Color
// Universal Design: how to make figures and presentations that are friendly
// to colorblind people", in their order without black: orange, sky blue,
// bluish green, yellow, blue, vermillion, reddish purple.
var OkabeIto = []color.NRGBA{
	{0xE6, 0x9F, 0x00, 0xFF},
	{0x56, 0xB4, 0xE9, 0xFF},
	{0x00, 0x9E, 0x73, 0xFF},
	{0xF0, 0xE4, 0x42, 0xFF},
	{0x00, 0x72, 0xB2, 0xFF},
	{0xD5, 0x5E, 0x00, 0xFF},
	{0xCC, 0x79, 0xA7, 0xFF},
}

// Plot is one plot to draw.
type Plot struct {
	Row, Column int    // field row and column, 1-based
	Number      int    // plot number, printed on the plot
	Code        string // treatment code, printed below the number
	Block       int    // blocks are outlined
	Unit        int    // main plot within the block (outlined thinner); 0 for none
	Sub         int    // subplot within the main plot (outlined thinner still); 0 for none
	Group       int    // colour: OkabeIto[Group % len]; negative for no fill
	Excluded    bool   // drawn hatched grey
}

// maxLabelled is the number of plots above which labels are left out, so
// that a very large trial still draws quickly.
const maxLabelled = 2500

// Map is the field plan widget.
type Map struct {
	widget.BaseWidget

	// OnHover is called with the index of the plot under the pointer, or
	// -1 when the pointer leaves the plots.
	OnHover func(i int)
	// OnTapped is called with the index of a tapped plot.
	OnTapped func(i int)

	plots    []Plot
	rows     int
	cols     int
	at       map[[2]int]int // (row, col) → plot index
	hover    int
	selected int

	north    string // "top", "right", "bottom", "left" or ""
	landmark string
}

// SetOrientation sets the north arrow (the map edge that faces north:
// "top", "right", "bottom" or "left"; anything else draws none) and the
// landmark written along the bottom edge, row 1 ("" for none).
func (m *Map) SetOrientation(north, landmark string) {
	switch north {
	case "top", "right", "bottom", "left":
	default:
		north = ""
	}
	if m.north == north && m.landmark == landmark {
		return
	}
	m.north, m.landmark = north, landmark
	m.Refresh()
}

// margins are the room kept beside the grid: at the right for the north
// arrow, below it for the landmark.
func (m *Map) margins() (right, bottom float32) {
	if m.north != "" {
		right = arrowRoom
	}
	if m.landmark != "" {
		bottom = theme.TextSize() * 1.6
	}
	return right, bottom
}

// arrowRoom is the width kept at the right of the grid for the north arrow.
const arrowRoom = 40

var (
	_ fyne.Widget       = (*Map)(nil)
	_ fyne.Tappable     = (*Map)(nil)
	_ desktop.Hoverable = (*Map)(nil)
)

// New returns an empty map.
func New() *Map {
	m := &Map{hover: -1, selected: -1}
	m.ExtendBaseWidget(m)
	return m
}

// SetPlots replaces the plots drawn.
func (m *Map) SetPlots(plots []Plot) {
	m.plots = append(m.plots[:0], plots...)
	m.rows, m.cols = 0, 0
	m.at = make(map[[2]int]int, len(plots))
	for i, p := range plots {
		m.rows = max(m.rows, p.Row)
		m.cols = max(m.cols, p.Column)
		m.at[[2]int{p.Row, p.Column}] = i
	}
	if m.selected >= len(plots) {
		m.selected = -1
	}
	m.Refresh()
}

// Plots returns the plots drawn.
func (m *Map) Plots() []Plot { return m.plots }

// Select marks plot i (−1 for none).
func (m *Map) Select(i int) {
	m.selected = i
	m.Refresh()
}

// Selected returns the marked plot or −1.
func (m *Map) Selected() int { return m.selected }

// geometry returns the size of one cell and the origin of the grid for a
// widget of size s: cells are square-ish and the grid is centred.
func (m *Map) geometry(s fyne.Size) (cw, ch float32, origin fyne.Position) {
	if m.rows == 0 || m.cols == 0 {
		return 0, 0, fyne.Position{}
	}
	right, bottom := m.margins()
	s = fyne.NewSize(max(1, s.Width-right), max(1, s.Height-bottom))
	cw = s.Width / float32(m.cols)
	ch = s.Height / float32(m.rows)
	// Plots are longer than wide on most maps; keep the aspect within 1:3.
	if ch > 3*cw {
		ch = 3 * cw
	}
	if cw > 3*ch {
		cw = 3 * ch
	}
	origin = fyne.NewPos((s.Width-cw*float32(m.cols))/2, (s.Height-ch*float32(m.rows))/2)
	return cw, ch, origin
}

// PlotAt returns the index of the plot at position p, or −1.
func (m *Map) PlotAt(p fyne.Position) int {
	cw, ch, o := m.geometry(m.Size())
	if cw == 0 {
		return -1
	}
	c := int((p.X-o.X)/cw) + 1
	r := m.rows - int((p.Y-o.Y)/ch) // row 1 at the bottom
	if p.X < o.X || p.Y < o.Y || c > m.cols || r < 1 {
		return -1
	}
	if i, ok := m.at[[2]int{r, c}]; ok {
		return i
	}
	return -1
}

// Tapped selects the plot under the pointer.
func (m *Map) Tapped(e *fyne.PointEvent) {
	i := m.PlotAt(e.Position)
	if i < 0 {
		return
	}
	m.Select(i)
	if m.OnTapped != nil {
		m.OnTapped(i)
	}
}

// MouseIn implements desktop.Hoverable.
func (m *Map) MouseIn(e *desktop.MouseEvent) { m.MouseMoved(e) }

// MouseMoved reports the plot under the pointer when it changes.
func (m *Map) MouseMoved(e *desktop.MouseEvent) {
	i := m.PlotAt(e.Position)
	if i == m.hover {
		return
	}
	m.hover = i
	m.Refresh()
	if m.OnHover != nil {
		m.OnHover(i)
	}
}

// MouseOut implements desktop.Hoverable.
func (m *Map) MouseOut() {
	if m.hover != -1 {
		m.hover = -1
		m.Refresh()
		if m.OnHover != nil {
			m.OnHover(-1)
		}
	}
}

// MinSize is small; the map scales to the space it is given.
func (m *Map) MinSize() fyne.Size { return fyne.NewSize(200, 150) }

// CreateRenderer implements fyne.Widget.
func (m *Map) CreateRenderer() fyne.WidgetRenderer {
	m.ExtendBaseWidget(m)
	return &renderer{m: m}
}

type renderer struct {
	m       *Map
	cells   []*canvas.Rectangle
	numbers []*canvas.Text
	codes   []*canvas.Text
	blocks  []*canvas.Rectangle
	units   []*canvas.Rectangle // main-plot outlines
	subs    []*canvas.Rectangle // subplot outlines
	mark    *canvas.Rectangle
	arrow   []*canvas.Line // shaft and the two sides of the head
	arrowN  *canvas.Text
	lm      *canvas.Text
	objects []fyne.CanvasObject
}

func (r *renderer) Destroy() {}

func (r *renderer) MinSize() fyne.Size { return r.m.MinSize() }

func (r *renderer) Objects() []fyne.CanvasObject { return r.objects }

// Refresh rebuilds the objects when the plots changed and restyles them.
func (r *renderer) Refresh() {
	m := r.m
	if r.mark == nil || len(r.cells) != len(m.plots) || len(r.blocks) != numBlocks(m.plots) || len(r.units) != len(unitKeys(m.plots)) || len(r.subs) != len(subKeys(m.plots)) {
		r.build()
	}
	labelled := len(m.plots) <= maxLabelled
	fg := theme.Color(theme.ColorNameForeground)
	for i, p := range m.plots {
		c := r.cells[i]
		c.FillColor = fillColor(p)
		c.StrokeWidth = 0.5
		c.StrokeColor = theme.Color(theme.ColorNameBackground)
		if labelled {
			r.numbers[i].Text = strconv.Itoa(p.Number)
			r.codes[i].Text = p.Code
			tc := textOn(c.FillColor, fg)
			r.numbers[i].Color, r.codes[i].Color = tc, tc
		}
	}
	for _, b := range r.blocks {
		b.StrokeColor = fg
	}
	for _, u := range r.units {
		u.StrokeColor = fg
	}
	for _, u := range r.subs {
		c := color.NRGBAModel.Convert(fg).(color.NRGBA)
		c.A = 0xA0
		u.StrokeColor = c
	}
	r.mark.StrokeColor = theme.Color(theme.ColorNamePrimary)
	for _, l := range r.arrow {
		l.StrokeColor = fg
	}
	r.arrowN.Color, r.lm.Color = fg, fg
	r.lm.Text = ""
	if m.landmark != "" {
		r.lm.Text = "Row 1 edge: " + m.landmark
	}
	r.Layout(m.Size())
	canvas.Refresh(m)
}

// unitKeys lists the (block, main plot) pairs of the plots that have a
// main plot, in the order they first appear.
func unitKeys(ps []Plot) [][2]int {
	seen := map[[2]int]bool{}
	var out [][2]int
	for _, p := range ps {
		k := [2]int{p.Block, p.Unit}
		if p.Unit != 0 && !seen[k] {
			seen[k] = true
			out = append(out, k)
		}
	}
	return out
}

// subKeys lists the (block, main plot, subplot) triples of the plots that
// have a subplot, in the order they first appear.
func subKeys(ps []Plot) [][3]int {
	seen := map[[3]int]bool{}
	var out [][3]int
	for _, p := range ps {
		k := [3]int{p.Block, p.Unit, p.Sub}
		if p.Unit != 0 && p.Sub != 0 && !seen[k] {
			seen[k] = true
			out = append(out, k)
		}
	}
	return out
}

func numBlocks(ps []Plot) int {
	seen := map[int]bool{}
	for _, p := range ps {
		seen[p.Block] = true
	}
	return len(seen)
}

func (r *renderer) build() {
	m := r.m
	labelled := len(m.plots) <= maxLabelled
	r.cells = make([]*canvas.Rectangle, len(m.plots))
	r.numbers, r.codes = nil, nil
	r.objects = r.objects[:0]
	for i := range m.plots {
		r.cells[i] = canvas.NewRectangle(color.Transparent)
		r.objects = append(r.objects, r.cells[i])
	}
	if labelled {
		r.numbers = make([]*canvas.Text, len(m.plots))
		r.codes = make([]*canvas.Text, len(m.plots))
		for i := range m.plots {
			r.numbers[i] = canvas.NewText("", nil)
			r.numbers[i].TextStyle = fyne.TextStyle{Bold: true}
			r.numbers[i].Alignment = fyne.TextAlignCenter
			r.codes[i] = canvas.NewText("", nil)
			r.codes[i].Alignment = fyne.TextAlignCenter
			r.objects = append(r.objects, r.numbers[i], r.codes[i])
		}
	}
	r.subs = nil
	for range subKeys(m.plots) {
		u := canvas.NewRectangle(color.Transparent)
		u.StrokeWidth = 1
		r.subs = append(r.subs, u)
		r.objects = append(r.objects, u)
	}
	r.units = nil
	for range unitKeys(m.plots) {
		u := canvas.NewRectangle(color.Transparent)
		u.StrokeWidth = 1.8
		r.units = append(r.units, u)
		r.objects = append(r.objects, u)
	}
	r.blocks = nil
	for range numBlocks(m.plots) {
		b := canvas.NewRectangle(color.Transparent)
		b.StrokeWidth = 2.5
		r.blocks = append(r.blocks, b)
		r.objects = append(r.objects, b)
	}
	r.mark = canvas.NewRectangle(color.Transparent)
	r.mark.StrokeWidth = 3
	r.objects = append(r.objects, r.mark)
	r.arrow = nil
	for range 3 {
		l := canvas.NewLine(color.Black)
		l.StrokeWidth = 2
		r.arrow = append(r.arrow, l)
		r.objects = append(r.objects, l)
	}
	r.arrowN = canvas.NewText("N", nil)
	r.arrowN.TextStyle = fyne.TextStyle{Bold: true}
	r.arrowN.Alignment = fyne.TextAlignCenter
	r.lm = canvas.NewText("", nil)
	r.lm.Alignment = fyne.TextAlignCenter
	r.objects = append(r.objects, r.arrowN, r.lm)
}

// layoutArrow draws the north arrow at the right of the grid, pointing to
// the map edge that faces north, with an N at its tip.
func (r *renderer) layoutArrow(s fyne.Size, top float32) {
	north := r.m.north
	hidden := north == ""
	for _, l := range r.arrow {
		l.Hidden = hidden
	}
	r.arrowN.Hidden = hidden
	if hidden {
		return
	}
	ts := theme.TextSize()
	cx := s.Width - arrowRoom/2
	cy := top + ts*1.5 + arrowRoom/2
	half := float32(arrowRoom)/2 - 4
	var ux, uy float32 // towards north, screen y down
	switch north {
	case "top":
		uy = -1
	case "bottom":
		uy = 1
	case "right":
		ux = 1
	case "left":
		ux = -1
	}
	at := func(along, across float32) fyne.Position {
		return fyne.NewPos(cx+along*ux-across*uy, cy+along*uy+across*ux)
	}
	tip := at(half, 0)
	set := func(l *canvas.Line, a, b fyne.Position) { l.Position1, l.Position2 = a, b }
	set(r.arrow[0], at(-half, 0), tip)
	set(r.arrow[1], tip, at(half*0.45, half*0.45))
	set(r.arrow[2], tip, at(half*0.45, -half*0.45))
	// The N beyond the tip (above it for an arrow pointing up).
	n := at(half+ts*0.8, 0)
	r.arrowN.TextSize = ts
	r.arrowN.Resize(fyne.NewSize(ts*1.5, ts*1.3))
	r.arrowN.Move(fyne.NewPos(n.X-ts*0.75, n.Y-ts*0.65))
}

// Layout places every plot, label and block outline.
func (r *renderer) Layout(s fyne.Size) {
	m := r.m
	cw, ch, o := m.geometry(s)
	// Row 1 at the bottom: row r's top edge is rows − r cells down.
	cellPos := func(p Plot) fyne.Position {
		return fyne.NewPos(o.X+float32(p.Column-1)*cw, o.Y+float32(m.rows-p.Row)*ch)
	}
	r.layoutArrow(s, o.Y)
	r.lm.Hidden = r.lm.Text == ""
	if !r.lm.Hidden {
		ts := theme.TextSize()
		r.lm.TextSize = ts
		r.lm.Move(fyne.NewPos(o.X, o.Y+float32(m.rows)*ch+ts*0.2))
		r.lm.Resize(fyne.NewSize(cw*float32(m.cols), ts*1.3))
	}
	textSize := min(ch/3.2, cw/3.2, theme.TextSize())
	showText := textSize >= 7
	for i, p := range m.plots {
		pos := cellPos(p)
		r.cells[i].Move(pos)
		r.cells[i].Resize(fyne.NewSize(cw, ch))
		if r.numbers == nil {
			continue
		}
		r.numbers[i].TextSize, r.codes[i].TextSize = textSize, textSize*0.9
		r.numbers[i].Hidden, r.codes[i].Hidden = !showText, !showText
		r.numbers[i].Move(fyne.NewPos(pos.X, pos.Y+ch/2-textSize*1.3))
		r.numbers[i].Resize(fyne.NewSize(cw, textSize*1.3))
		r.codes[i].Move(fyne.NewPos(pos.X, pos.Y+ch/2))
		r.codes[i].Resize(fyne.NewSize(cw, textSize*1.3))
	}
	// Block outlines: the bounding box of each block's plots.
	type box struct{ r0, c0, r1, c1 int }
	boxes := map[int]*box{}
	var order []int
	for _, p := range m.plots {
		b, ok := boxes[p.Block]
		if !ok {
			b = &box{p.Row, p.Column, p.Row, p.Column}
			boxes[p.Block] = b
			order = append(order, p.Block)
		}
		b.r0, b.c0 = min(b.r0, p.Row), min(b.c0, p.Column)
		b.r1, b.c1 = max(b.r1, p.Row), max(b.c1, p.Column)
	}
	for i, k := range order {
		if i >= len(r.blocks) {
			break
		}
		b := boxes[k]
		r.blocks[i].Move(fyne.NewPos(o.X+float32(b.c0-1)*cw, o.Y+float32(m.rows-b.r1)*ch))
		r.blocks[i].Resize(fyne.NewSize(float32(b.c1-b.c0+1)*cw, float32(b.r1-b.r0+1)*ch))
	}
	// Main-plot outlines: the bounding box of each main plot's plots.
	ubox := map[[2]int]*box{}
	for _, p := range m.plots {
		if p.Unit == 0 {
			continue
		}
		k := [2]int{p.Block, p.Unit}
		b, ok := ubox[k]
		if !ok {
			b = &box{p.Row, p.Column, p.Row, p.Column}
			ubox[k] = b
		}
		b.r0, b.c0 = min(b.r0, p.Row), min(b.c0, p.Column)
		b.r1, b.c1 = max(b.r1, p.Row), max(b.c1, p.Column)
	}
	for i, k := range unitKeys(m.plots) {
		if i >= len(r.units) {
			break
		}
		b := ubox[k]
		r.units[i].Move(fyne.NewPos(o.X+float32(b.c0-1)*cw, o.Y+float32(m.rows-b.r1)*ch))
		r.units[i].Resize(fyne.NewSize(float32(b.c1-b.c0+1)*cw, float32(b.r1-b.r0+1)*ch))
	}
	sbox := map[[3]int]*box{}
	for _, p := range m.plots {
		if p.Unit == 0 || p.Sub == 0 {
			continue
		}
		k := [3]int{p.Block, p.Unit, p.Sub}
		b, ok := sbox[k]
		if !ok {
			b = &box{p.Row, p.Column, p.Row, p.Column}
			sbox[k] = b
		}
		b.r0, b.c0 = min(b.r0, p.Row), min(b.c0, p.Column)
		b.r1, b.c1 = max(b.r1, p.Row), max(b.c1, p.Column)
	}
	for i, k := range subKeys(m.plots) {
		if i >= len(r.subs) {
			break
		}
		b := sbox[k]
		r.subs[i].Move(fyne.NewPos(o.X+float32(b.c0-1)*cw, o.Y+float32(m.rows-b.r1)*ch))
		r.subs[i].Resize(fyne.NewSize(float32(b.c1-b.c0+1)*cw, float32(b.r1-b.r0+1)*ch))
	}
	mark := m.hover
	if mark < 0 {
		mark = m.selected
	}
	r.mark.Hidden = mark < 0 || mark >= len(m.plots)
	if !r.mark.Hidden {
		r.mark.Move(cellPos(m.plots[mark]))
		r.mark.Resize(fyne.NewSize(cw, ch))
	}
}

// fillColor is a plot's fill: its group's palette colour, grey when the
// plot is excluded, none for a negative group.
func fillColor(p Plot) color.Color {
	if p.Excluded {
		return color.NRGBA{0x9a, 0x9a, 0x9a, 0xff}
	}
	if p.Group < 0 {
		return color.Transparent
	}
	return OkabeIto[p.Group%len(OkabeIto)]
}

// textOn picks black or white text for a fill by its relative luminance
// (WCAG 2.1 definition), or the theme's foreground on no fill.
func textOn(c color.Color, fg color.Color) color.Color {
	r, g, b, a := c.RGBA()
	if a == 0 {
		return fg
	}
	lum := 0.2126*lin(r) + 0.7152*lin(g) + 0.0722*lin(b)
	if lum > 0.4 {
		return color.Black
	}
	return color.White
}

// lin linearises one sRGB channel (WCAG 2.1 relative luminance).
func lin(v uint32) float64 {
	c := float64(v) / 0xffff
	if c <= 0.04045 {
		return c / 12.92
	}
	return math.Pow((c+0.055)/1.055, 2.4)
}
