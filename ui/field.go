package ui

import (
	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/widget"
)

type fieldStep struct{ root fyne.CanvasObject }

func newFieldStep(u *App) *fieldStep         { return &fieldStep{root: widget.NewLabel("Field")} }
func (s *fieldStep) object() fyne.CanvasObject { return s.root }
func (s *fieldStep) refresh(change)            {}
