package ui

import (
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"
)

// walkObjects lists o and every object inside it (containers and widgets'
// renderers), depth first.
func walkObjects(o fyne.CanvasObject) []fyne.CanvasObject {
	var out []fyne.CanvasObject
	var walk func(o fyne.CanvasObject)
	walk = func(o fyne.CanvasObject) {
		if o == nil {
			return
		}
		out = append(out, o)
		switch v := o.(type) {
		case *fyne.Container:
			for _, c := range v.Objects {
				walk(c)
			}
		case fyne.Widget:
			for _, c := range test.WidgetRenderer(v).Objects() {
				walk(c)
			}
		}
	}
	walk(o)
	return out
}

// findCheck finds the check box inside o whose text starts with prefix.
func findCheck(o fyne.CanvasObject, prefix string) *widget.Check {
	for _, x := range walkObjects(o) {
		if c, ok := x.(*widget.Check); ok && strings.HasPrefix(c.Text, prefix) {
			return c
		}
	}
	return nil
}

// findButton finds the button inside o labelled text.
func findButton(o fyne.CanvasObject, text string) *widget.Button {
	for _, x := range walkObjects(o) {
		if b, ok := x.(*widget.Button); ok && b.Text == text {
			return b
		}
	}
	return nil
}

// overlayText is the text of every label and canvas text inside o.
func overlayText(o fyne.CanvasObject) string {
	var b strings.Builder
	for _, x := range walkObjects(o) {
		switch v := x.(type) {
		case *widget.Label:
			b.WriteString(v.Text + "\n")
		case *canvas.Text:
			b.WriteString(v.Text + "\n")
		}
	}
	return b.String()
}
