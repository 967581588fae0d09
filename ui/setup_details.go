package ui

import (
	"errors"
	"fmt"
	"sort"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// detailsTab is the Setup step's Details tab: title, crop, season, site
// and the notes of the trial.
type detailsTab struct {
	u       *App
	content fyne.CanvasObject

	title, season, site, lat, lon, soil, prev, investigator *widget.Entry
	crop                                                    *widget.SelectEntry
	objective, notes                                        *widget.Entry
	loading                                                 bool
}

// newDetailsTab builds the tab.
func newDetailsTab(u *App) *detailsTab {
	s := &detailsTab{u: u}
	s.content = s.build()
	return s
}

func (s *detailsTab) build() fyne.CanvasObject {
	edit := func(set func(t *trial.Trial, v string)) func(string) {
		return func(v string) {
			if s.loading {
				return
			}
			set(s.t(), v)
			s.u.doc.edited(changeDetails)
		}
	}
	entry := func(ph string, set func(*trial.Trial, string)) *widget.Entry {
		e := widget.NewEntry()
		e.SetPlaceHolder(ph)
		e.OnChanged = edit(set)
		return e
	}
	s.title = entry("for example Spring wheat entries, north field", func(t *trial.Trial, v string) { t.Title = v })
	s.title.Validator = func(v string) error {
		if strings.TrimSpace(v) == "" {
			return errors.New("give the trial a title")
		}
		return nil
	}
	crops := make([]string, 0, len(trial.CropDefaults))
	for k := range trial.CropDefaults {
		crops = append(crops, k)
	}
	sort.Strings(crops)
	s.crop = widget.NewSelectEntry(crops)
	s.crop.SetPlaceHolder("choose or type a crop")
	s.crop.OnChanged = edit(func(t *trial.Trial, v string) { t.Crop = v })
	s.season = entry("for example 2026 or 2026/27", func(t *trial.Trial, v string) { t.Season = v })
	s.site = entry("farm and field", func(t *trial.Trial, v string) { t.Site.Name = v })
	coord := func(ph string, lim float64, set func(*trial.Trial, *float64)) *widget.Entry {
		e := widget.NewEntry()
		e.SetPlaceHolder(ph)
		e.Validator = func(v string) error {
			if strings.TrimSpace(v) == "" {
				return nil
			}
			f, err := trial.ParseNumber(v, trial.PointOrComma)
			if err != nil || f < -lim || f > lim {
				return fmt.Errorf("a number of decimal degrees between −%g and %g", lim, lim)
			}
			return nil
		}
		e.OnChanged = func(v string) {
			if s.loading {
				return
			}
			v = strings.TrimSpace(v)
			if v == "" {
				set(s.t(), nil)
			} else if f, err := trial.ParseNumber(v, trial.PointOrComma); err == nil && f >= -lim && f <= lim {
				set(s.t(), &f)
			} else {
				return
			}
			s.u.doc.edited(changeDetails)
		}
		return e
	}
	s.lat = coord("latitude, for example 52.123", 90, func(t *trial.Trial, v *float64) { t.Site.Latitude = v })
	s.lon = coord("longitude, for example -1.456", 180, func(t *trial.Trial, v *float64) { t.Site.Longitude = v })
	s.soil = entry("for example silty clay loam", func(t *trial.Trial, v string) { t.Site.Soil = v })
	s.prev = entry("for example oilseed rape", func(t *trial.Trial, v string) { t.Site.PreviousCrop = v })
	s.investigator = entry("who runs the trial", func(t *trial.Trial, v string) { t.Investigator = v })
	s.objective = widget.NewMultiLineEntry()
	s.objective.SetMinRowsVisible(2)
	s.objective.SetPlaceHolder("what the trial should find out")
	s.objective.OnChanged = edit(func(t *trial.Trial, v string) { t.Objective = v })
	s.notes = widget.NewMultiLineEntry()
	s.notes.SetMinRowsVisible(3)
	s.notes.OnChanged = edit(func(t *trial.Trial, v string) { t.Notes = v })
	form := widget.NewForm(
		widget.NewFormItem("Title", s.title),
		widget.NewFormItem("Crop", s.crop),
		widget.NewFormItem("Season", s.season),
		widget.NewFormItem("Site", s.site),
		widget.NewFormItem("Latitude", s.lat),
		widget.NewFormItem("Longitude", s.lon),
		widget.NewFormItem("Soil", s.soil),
		widget.NewFormItem("Previous crop", s.prev),
		widget.NewFormItem("Investigator", s.investigator),
		widget.NewFormItem("Objective", s.objective),
		widget.NewFormItem("Notes", s.notes),
	)
	return container.NewVScroll(container.NewPadded(form))
}

func coordText(p *float64) string {
	if p == nil {
		return ""
	}
	return strconv.FormatFloat(*p, 'f', -1, 64)
}

func (s *detailsTab) t() *trial.Trial { return s.u.doc.t }

// load puts the trial's details into the form without recording edits.
func (s *detailsTab) load(t *trial.Trial) {
	s.loading = true
	setIf := func(e interface{ SetText(string) }, cur, v string) {
		if cur != v {
			e.SetText(v)
		}
	}
	setIf(s.title, s.title.Text, t.Title)
	setIf(s.crop, s.crop.Text, t.Crop)
	setIf(s.season, s.season.Text, t.Season)
	setIf(s.site, s.site.Text, t.Site.Name)
	setIf(s.lat, s.lat.Text, coordText(t.Site.Latitude))
	setIf(s.lon, s.lon.Text, coordText(t.Site.Longitude))
	setIf(s.soil, s.soil.Text, t.Site.Soil)
	setIf(s.prev, s.prev.Text, t.Site.PreviousCrop)
	setIf(s.investigator, s.investigator.Text, t.Investigator)
	setIf(s.objective, s.objective.Text, t.Objective)
	setIf(s.notes, s.notes.Text, t.Notes)
	s.loading = false
}
