// Package ui is Furlong's desktop window: a guided sequence of steps (Setup,
// Field, Record, Compare, Report) around one open trial, with autosave,
// undo, crash recovery and exports.
//
// The package never creates the Fyne application itself: cmd/furlong passes
// in the fyne.App and fyne.Window, so the whole window can be built and
// driven headless by fyne.io/fyne/v2/test.
package ui
