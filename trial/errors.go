package trial

import (
	"errors"
	"fmt"
	"strings"
)

// ErrHasData is returned when an operation would move treatments away from
// values already recorded on the plots, for example randomising again or
// changing the treatment list of a trial that holds data.
var ErrHasData = errors.New("this trial already holds recorded data; randomising again would move treatments away from their values. Start a copy of the trial instead.")

// ErrUnknownMethod is returned when a trial records a randomisation method
// this version of Furlong cannot reproduce.
var ErrUnknownMethod = errors.New("the trial was randomised with a method this version of Furlong does not know, so its layout cannot be reproduced")

// ErrLayoutMismatch is returned by CheckRandomization when the stored plots
// are not the layout that the recorded seed gives.
var ErrLayoutMismatch = errors.New("the plots in this trial are not the layout its recorded seed gives; the file may have been edited by hand")

// ErrNotRandomized is returned by CheckRandomization for a trial that was
// never randomised.
var ErrNotRandomized = errors.New("this trial has not been randomised yet")

// ValidationError is one problem found in a trial. Field names the part of
// the trial at fault in Go selector form, for example "Treatments[2].Code"
// or "Design.Reps", so that a form can highlight it; Msg is a plain sentence
// for the trial manager.
type ValidationError struct {
	Field string
	Msg   string
}

// Error returns the plain-language message.
func (e *ValidationError) Error() string { return e.Msg }

// ValidationErrors is every problem found in a trial, in the order checked.
type ValidationErrors []*ValidationError

// Error joins the messages, one per line.
func (es ValidationErrors) Error() string {
	switch len(es) {
	case 0:
		return "no problems found"
	case 1:
		return es[0].Msg
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%d problems found:", len(es))
	for _, e := range es {
		b.WriteString("\n- ")
		b.WriteString(e.Msg)
	}
	return b.String()
}

// Unwrap returns the individual errors, for errors.As and errors.Is.
func (es ValidationErrors) Unwrap() []error {
	out := make([]error, len(es))
	for i, e := range es {
		out[i] = e
	}
	return out
}

// problems collects validation errors.
type problems struct {
	list ValidationErrors
}

func (p *problems) add(field, format string, args ...any) {
	p.list = append(p.list, &ValidationError{Field: field, Msg: fmt.Sprintf(format, args...)})
}

// err returns nil when nothing was found, otherwise the collected errors.
func (p *problems) err() error {
	if len(p.list) == 0 {
		return nil
	}
	return p.list
}
