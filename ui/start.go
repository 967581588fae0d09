package ui

import (
	"path/filepath"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"
)

// startScreen is shown while no trial is open.
type startScreen struct {
	u      *App
	recent *fyne.Container
	root   fyne.CanvasObject

	openBtn, newBtn, demoBtn *widget.Button
	// The trial series: open a series file, start one, the demo series.
	openSeriesBtn, newSeriesBtn, demoSeriesBtn *widget.Button
}

func newStartScreen(u *App) *startScreen {
	s := &startScreen{u: u}
	title := widget.NewRichTextFromMarkdown("# Furlong\n\nPlan a replicated field trial, record plot data and compare treatments.")
	s.openBtn = widget.NewButtonWithIcon("Open a trial file…", theme.FolderOpenIcon(), u.openDialog)
	s.openBtn.Importance = widget.HighImportance
	s.newBtn = widget.NewButtonWithIcon("Start a new trial", theme.DocumentCreateIcon(), u.newTrial)
	s.demoBtn = widget.NewButtonWithIcon("Look around in the demo trial", theme.InfoIcon(), func() { _ = u.OpenDemo() })
	seriesHead := widget.NewLabelWithStyle("Trial series: the same entries at several sites or seasons", fyne.TextAlignLeading, fyne.TextStyle{Bold: true})
	s.openSeriesBtn = widget.NewButtonWithIcon("Open a series…", theme.FolderOpenIcon(), u.openSeriesDialog)
	s.newSeriesBtn = widget.NewButtonWithIcon("New series", theme.ContentAddIcon(), u.NewSeries)
	s.demoSeriesBtn = widget.NewButtonWithIcon("Demo series", theme.InfoIcon(), func() { _ = u.OpenDemoSeries() })
	seriesRow := container.NewGridWithColumns(3, s.openSeriesBtn, s.newSeriesBtn, s.demoSeriesBtn)
	s.recent = container.NewVBox()
	recentHead := widget.NewLabelWithStyle("Recent trials", fyne.TextAlignLeading, fyne.TextStyle{Bold: true})
	col := container.NewVBox(title, s.openBtn, s.newBtn, s.demoBtn, widget.NewSeparator(), seriesHead, seriesRow,
		widget.NewSeparator(), recentHead, s.recent)
	s.root = container.NewCenter(container.NewGridWrap(fyne.NewSize(520, col.MinSize().Height+260), container.NewVScroll(col)))
	return s
}

func (s *startScreen) object() fyne.CanvasObject { return s.root }

// refresh rebuilds the list of recent files.
func (s *startScreen) refresh() {
	s.recent.Objects = nil
	for _, p := range s.u.prefs.recent {
		path := p
		b := widget.NewButtonWithIcon(filepath.Base(path)+"   ("+filepath.Dir(path)+")", theme.DocumentIcon(), func() {
			s.u.openPath(path) // a missing file is explained and leaves the list
		})
		b.Alignment = widget.ButtonAlignLeading
		b.Importance = widget.LowImportance
		s.recent.Add(b)
	}
	if len(s.u.prefs.recent) == 0 {
		l := widget.NewLabel("Trials you open or save appear here.")
		l.Importance = widget.LowImportance
		s.recent.Add(l)
	}
	s.recent.Refresh()
}
