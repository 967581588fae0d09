package ui

import (
	"image/color"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/theme"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansbolditalic"
	"codeberg.org/go-fonts/liberation/liberationsansitalic"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
)

// furlongTheme wraps the default theme with an earthy primary colour and a
// few status colours; everything else comes from the default theme, so the
// window follows the system's light or dark variant.
type furlongTheme struct {
	fyne.Theme
}

var _ fyne.Theme = furlongTheme{}

func newTheme() fyne.Theme { return furlongTheme{Theme: theme.DefaultTheme()} }

// Colour names of our own, for cells and the navigator.
const (
	colorNameFlag     fyne.ThemeColorName = "furlongFlag"     // out-of-range value
	colorNameExcluded fyne.ThemeColorName = "furlongExcluded" // excluded plot
	colorNameNext     fyne.ThemeColorName = "furlongNext"     // the suggested next step
)

// Color returns the earthy palette for the primary and our own names and
// defers to the default theme for the rest.
func (t furlongTheme) Color(n fyne.ThemeColorName, v fyne.ThemeVariant) color.Color {
	dark := v == theme.VariantDark
	switch n {
	case theme.ColorNamePrimary:
		if dark {
			return color.NRGBA{R: 0xd9, G: 0x9a, B: 0x5b, A: 0xff} // light ochre
		}
		return color.NRGBA{R: 0x8a, G: 0x5a, B: 0x2b, A: 0xff} // soil brown
	case theme.ColorNameFocus:
		return color.NRGBA{R: 0xb0, G: 0x7a, B: 0x40, A: 0x70}
	case theme.ColorNameSelection:
		return color.NRGBA{R: 0xb0, G: 0x7a, B: 0x40, A: 0x50}
	case theme.ColorNameWarning:
		if !dark {
			// The default orange is hard to read as text on white (about
			// 2:1); a deeper amber keeps warnings readable (about 5:1).
			return color.NRGBA{R: 0xa8, G: 0x5a, B: 0x00, A: 0xff}
		}
	case colorNameFlag:
		if dark {
			return color.NRGBA{R: 0x8c, G: 0x5e, B: 0x00, A: 0xff}
		}
		return color.NRGBA{R: 0xff, G: 0xd8, B: 0x8a, A: 0xff}
	case colorNameExcluded:
		if dark {
			return color.NRGBA{R: 0x48, G: 0x48, B: 0x4c, A: 0xff}
		}
		return color.NRGBA{R: 0xdc, G: 0xdc, B: 0xdc, A: 0xff}
	case colorNameNext:
		if dark {
			return color.NRGBA{R: 0x4b, G: 0x6b, B: 0x2f, A: 0xff}
		}
		return color.NRGBA{R: 0xd7, G: 0xe8, B: 0xc0, A: 0xff}
	}
	return t.Theme.Color(n, v)
}

// themeColor looks up a colour in the current theme and variant.
func themeColor(n fyne.ThemeColorName) color.Color {
	return theme.Color(n)
}

// The window's text face is Liberation Sans, the face of the charts
// (chart.Face) and the name the workbook gives its cells
// (chart.FontFamily): one family on screen, in charts and in exports.
var (
	fontRegular    = fyne.NewStaticResource("LiberationSans-Regular.ttf", liberationsansregular.TTF)
	fontBold       = fyne.NewStaticResource("LiberationSans-Bold.ttf", liberationsansbold.TTF)
	fontItalic     = fyne.NewStaticResource("LiberationSans-Italic.ttf", liberationsansitalic.TTF)
	fontBoldItalic = fyne.NewStaticResource("LiberationSans-BoldItalic.ttf", liberationsansbolditalic.TTF)
)

// Font returns Liberation Sans for text and the default theme's face for
// monospace and symbols.
func (t furlongTheme) Font(s fyne.TextStyle) fyne.Resource {
	if s.Monospace || s.Symbol {
		return t.Theme.Font(s)
	}
	switch {
	case s.Bold && s.Italic:
		return fontBoldItalic
	case s.Bold:
		return fontBold
	case s.Italic:
		return fontItalic
	}
	return fontRegular
}
