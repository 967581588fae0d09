package ui

import (
	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/widget"
)

type reportStep struct{ root fyne.CanvasObject }

func newReportStep(u *App) *reportStep         { return &reportStep{root: widget.NewLabel("Report")} }
func (s *reportStep) object() fyne.CanvasObject { return s.root }
func (s *reportStep) refresh(change)            {}
