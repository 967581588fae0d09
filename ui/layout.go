package ui

import (
	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/theme"
)

// columnsLayout lays objects out in rows of cols cells, each column as wide
// as its widest cell (a plain grid makes every column as wide as the
// widest cell of all, which wastes the width of a small table).
type columnsLayout struct{ cols int }

func (l columnsLayout) widths(objs []fyne.CanvasObject) ([]float32, []float32) {
	w := make([]float32, l.cols)
	rows := (len(objs) + l.cols - 1) / l.cols
	h := make([]float32, rows)
	for i, o := range objs {
		ms := o.MinSize()
		w[i%l.cols] = max(w[i%l.cols], ms.Width)
		h[i/l.cols] = max(h[i/l.cols], ms.Height)
	}
	return w, h
}

// Layout implements fyne.Layout.
func (l columnsLayout) Layout(objs []fyne.CanvasObject, _ fyne.Size) {
	w, h := l.widths(objs)
	pad := theme.Padding()
	y := float32(0)
	for r := range h {
		x := float32(0)
		for c := range l.cols {
			i := r*l.cols + c
			if i >= len(objs) {
				break
			}
			objs[i].Move(fyne.NewPos(x, y))
			objs[i].Resize(fyne.NewSize(w[c], h[r]))
			x += w[c] + pad
		}
		y += h[r]
	}
}

// MinSize implements fyne.Layout.
func (l columnsLayout) MinSize(objs []fyne.CanvasObject) fyne.Size {
	w, h := l.widths(objs)
	var s fyne.Size
	for _, v := range w {
		s.Width += v + theme.Padding()
	}
	for _, v := range h {
		s.Height += v
	}
	return s
}
