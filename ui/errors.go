package ui

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// message is an error told in plain words: what happened and what to do.
type message struct {
	What string // one sentence: what Furlong could not do and why
	Do   string // what the user can do about it
}

// explain turns an error from one of Furlong's packages into a message.
// action says what the user was doing, as a sentence without a full stop,
// for example "The trial file could not be opened".
func explain(action string, err error) message {
	var verrs trial.ValidationErrors
	var verr *trial.ValidationError
	var perr *fs.PathError
	switch {
	case isExactly(err, trial.ErrHasData):
		return message{action + ": the trial already holds recorded data, and randomising again would move treatments away from their values.",
			"Keep the current layout, or save a copy of the trial under a new name and start the copy afresh."}
	case errors.Is(err, trial.ErrHasData):
		// Another edit refused for the same reason (treatments, design,
		// field arrangement): the trial package's message names the edit.
		return message{action + ": " + lowerFirst(err.Error()),
			"Keep the trial as it is, or save a copy of it under a new name and make the change in the copy."}
	case errors.Is(err, trial.ErrUnknownMethod):
		return message{action + ": the trial was randomised by a method this version of Furlong does not know.",
			"Open the trial with the version of Furlong that made it, or update Furlong."}
	case errors.Is(err, trial.ErrLayoutMismatch):
		return message{action + ": the plots in the file are not the layout its recorded seed gives; the file may have been edited by hand.",
			"Check the plot list against the stakes in the field before recording more data."}
	case errors.Is(err, trial.ErrNotRandomized):
		return message{action + ": the trial has not been randomised yet.",
			"Go to the Field step and press Randomise."}
	case errors.As(err, &verrs):
		return message{action + ": " + lowerFirst(verrs.Error()), "Correct the entries named above in the Setup step."}
	case errors.As(err, &verr):
		return message{action + ": " + lowerFirst(verr.Msg), "Correct the entry in the Setup step."}
	case errors.Is(err, fs.ErrNotExist):
		return message{action + ": the file does not exist (it may have been moved, renamed or deleted).",
			"Choose the file again with Open."}
	case errors.Is(err, fs.ErrPermission):
		return message{action + ": Furlong is not allowed to read or write that file.",
			"Choose another folder, or ask whoever manages this computer for access."}
	case errors.As(err, &perr):
		return message{action + ": the file system reported a problem with " + perr.Path + " (" + perr.Err.Error() + ").",
			"Check that the disk is connected and not full, then try again."}
	}
	if m, ok := explainPackages(action, err); ok {
		return m
	}
	return message{action + ": " + lowerFirst(err.Error()),
		"If the problem remains, note what you were doing and report it together with the file."}
}

// isExactly reports whether target itself is in err's chain, not only an
// error that calls itself target (errors.Is follows Is methods too).
func isExactly(err, target error) bool {
	for err != nil {
		if err == target {
			return true
		}
		switch u := err.(type) {
		case interface{ Unwrap() error }:
			err = u.Unwrap()
		case interface{ Unwrap() []error }:
			for _, e := range u.Unwrap() {
				if isExactly(e, target) {
					return true
				}
			}
			return false
		default:
			return false
		}
	}
	return false
}

// lowerFirst makes a sentence continue after a colon.
func lowerFirst(s string) string {
	s = strings.TrimSpace(s)
	if s == "" {
		return "an unknown problem occurred."
	}
	if len(s) > 1 && s[1] >= 'a' && s[1] <= 'z' && s[0] >= 'A' && s[0] <= 'Z' {
		s = strings.ToLower(s[:1]) + s[1:]
	}
	if !strings.HasSuffix(s, ".") {
		s += "."
	}
	return s
}

// showError shows err as a dialog in plain words on w.
func showError(w fyne.Window, title, action string, err error) {
	showMessage(w, title, explain(action, err))
}

// backupHint stands for the backup copy in the advice of explain; forFile
// names the real one.
const backupHint = "NAME.furlong.bak"

// forFile fits m to the trial file at path: the advice names the file's
// backup copy, or says there is none.
func (m message) forFile(path string) message {
	if !strings.Contains(m.Do, backupHint) {
		return m
	}
	bak := path + trialfile.BackupSuffix
	if fi, err := os.Stat(bak); err == nil && fi.Mode().IsRegular() {
		m.Do = strings.ReplaceAll(m.Do, backupHint, filepath.Base(bak))
		return m
	}
	m.Do = "There is no backup copy (" + filepath.Base(bak) + ") next to it. Open an earlier copy of the trial if you keep one, " +
		"or start again from its field book."
	return m
}

// showMessage shows m as a dialog on w.
func showMessage(w fyne.Window, title string, m message) {
	what := widget.NewLabel(m.What)
	what.Wrapping = fyne.TextWrapWord
	todo := widget.NewLabel(m.Do)
	todo.Wrapping = fyne.TextWrapWord
	todo.TextStyle = fyne.TextStyle{Italic: true}
	box := container.NewVBox(what, todo)
	d := dialog.NewCustom(title, "OK", box, w)
	d.Resize(fyne.NewSize(500, 240))
	d.Show()
	closeOnEscape(w, d)
}
