package ui

import (
	"fyne.io/fyne/v2"

	"furlong/stats/meansep"
)

// Preference keys. Every key Furlong stores is named here.
const (
	keyWindowWidth  = "window.width"
	keyWindowHeight = "window.height"
	keyLastFolder   = "files.lastFolder"
	keyRecent       = "files.recent"
	keyUnits        = "settings.units"
	keyAlpha        = "settings.alpha"
	keyMethod       = "settings.method"
	keyMeansOrder   = "settings.meansOrder"
)

// Values of keyUnits.
const (
	unitsMetric   = "metric"
	unitsImperial = "imperial"
)

// Values of keyMeansOrder: how the table of means is sorted.
const (
	orderBestFirst = "best-first"  // best mean first (highest, or lowest when lower is better)
	orderTrial     = "trial-order" // the trial's treatment order
)

// maxRecent is the number of recent files remembered.
const maxRecent = 8

// prefs holds the user's settings, loaded once from the injected
// fyne.Preferences; each setter writes exactly one key.
type prefs struct {
	store fyne.Preferences

	windowWidth, windowHeight float64
	lastFolder                string
	recent                    []string
	units                     string
	alpha                     float64
	method                    meansep.Method
	meansOrder                string
}

// loadPrefs reads every setting with its fallback.
func loadPrefs(p fyne.Preferences) *prefs {
	s := &prefs{store: p}
	s.windowWidth = p.FloatWithFallback(keyWindowWidth, 1280)
	s.windowHeight = p.FloatWithFallback(keyWindowHeight, 720)
	s.lastFolder = p.StringWithFallback(keyLastFolder, "")
	s.recent = p.StringListWithFallback(keyRecent, nil)
	s.units = p.StringWithFallback(keyUnits, unitsMetric)
	if s.units != unitsImperial {
		s.units = unitsMetric
	}
	s.alpha = p.FloatWithFallback(keyAlpha, 0.05)
	if s.alpha <= 0 || s.alpha >= 0.5 {
		s.alpha = 0.05
	}
	s.method = meansep.Method(p.StringWithFallback(keyMethod, string(meansep.LSD)))
	if s.method != meansep.Tukey {
		s.method = meansep.LSD
	}
	s.meansOrder = p.StringWithFallback(keyMeansOrder, orderBestFirst)
	if s.meansOrder != orderTrial {
		s.meansOrder = orderBestFirst
	}
	return s
}

func (s *prefs) onWindowSizeChanged(size fyne.Size) {
	if size.Width < 200 || size.Height < 200 {
		return
	}
	s.windowWidth, s.windowHeight = float64(size.Width), float64(size.Height)
	s.store.SetFloat(keyWindowWidth, s.windowWidth)
	s.store.SetFloat(keyWindowHeight, s.windowHeight)
}

func (s *prefs) onLastFolderChanged(dir string) {
	s.lastFolder = dir
	s.store.SetString(keyLastFolder, dir)
}

// onFileOpened puts path first in the recent files list.
func (s *prefs) onFileOpened(path string) {
	list := []string{path}
	for _, p := range s.recent {
		if p != path && len(list) < maxRecent {
			list = append(list, p)
		}
	}
	s.recent = list
	s.store.SetStringList(keyRecent, list)
}

// onRecentRemoved drops a path (for example a file that no longer exists).
func (s *prefs) onRecentRemoved(path string) {
	var list []string
	for _, p := range s.recent {
		if p != path {
			list = append(list, p)
		}
	}
	s.recent = list
	s.store.SetStringList(keyRecent, list)
}

func (s *prefs) onUnitsChanged(u string) {
	s.units = u
	s.store.SetString(keyUnits, u)
}

func (s *prefs) onAlphaChanged(a float64) {
	s.alpha = a
	s.store.SetFloat(keyAlpha, a)
}

func (s *prefs) onMethodChanged(m meansep.Method) {
	s.method = m
	s.store.SetString(keyMethod, string(m))
}

func (s *prefs) onMeansOrderChanged(o string) {
	s.meansOrder = o
	s.store.SetString(keyMeansOrder, o)
}
