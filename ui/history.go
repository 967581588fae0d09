package ui

import (
	"fmt"
	"slices"

	"furlong/trial"
)

// command is one undoable edit of a trial.
type command interface {
	do(t *trial.Trial)
	undo(t *trial.Trial)
	kind() change
	label() string // for the Edit menu, "Undo value of plot 101"
}

// maxHistory bounds the undo stack.
const maxHistory = 500

// history is an undo/redo stack of commands.
type history struct {
	done   []command
	undone []command
}

func (h *history) push(c command) {
	h.done = append(h.done, c)
	if len(h.done) > maxHistory {
		h.done = slices.Delete(h.done, 0, len(h.done)-maxHistory)
	}
	h.undone = h.undone[:0]
}

func (h *history) undo() command {
	if len(h.done) == 0 {
		return nil
	}
	c := h.done[len(h.done)-1]
	h.done = h.done[:len(h.done)-1]
	h.undone = append(h.undone, c)
	return c
}

func (h *history) redo() command {
	if len(h.undone) == 0 {
		return nil
	}
	c := h.undone[len(h.undone)-1]
	h.undone = h.undone[:len(h.undone)-1]
	h.done = append(h.done, c)
	return c
}

func (h *history) canUndo() bool { return len(h.done) > 0 }
func (h *history) canRedo() bool { return len(h.undone) > 0 }

// setValue changes one stored value. It is recorded after trial.SetValue
// accepted the new value; undo and redo only move between values the trial
// accepted, in stack order, so they assign directly.
type setValue struct {
	trait, plot int // indices into Trial.Traits and Trial.Plots
	old, new    float64
	what        string // "plot 103, Yield", for the undo label
}

func (c *setValue) do(t *trial.Trial)   { t.Traits[c.trait].Values[c.plot] = c.new }
func (c *setValue) undo(t *trial.Trial) { t.Traits[c.trait].Values[c.plot] = c.old }
func (c *setValue) kind() change        { return changeValues }
func (c *setValue) label() string {
	if c.what == "" {
		return "value entry"
	}
	return "value of " + c.what
}
func (c *setValue) plotRow() int { return c.plot }

// setExclusions replaces a plot's exclusions and note.
type setExclusions struct {
	plot             int
	number           int // the plot's number, for the undo label
	old, new         []trial.Exclusion
	oldNote, newNote string
}

func (c *setExclusions) do(t *trial.Trial) {
	t.Plots[c.plot].Exclusions = slices.Clone(c.new)
	t.Plots[c.plot].Note = c.newNote
}

func (c *setExclusions) undo(t *trial.Trial) {
	t.Plots[c.plot].Exclusions = slices.Clone(c.old)
	t.Plots[c.plot].Note = c.oldNote
}

func (c *setExclusions) kind() change { return changeValues }
func (c *setExclusions) plotRow() int { return c.plot }
func (c *setExclusions) label() string {
	if c.number == 0 {
		return "exclusion change"
	}
	return fmt.Sprintf("exclusion of plot %d", c.number)
}

// replaceTrial swaps the whole trial content, for imports and other edits
// that touch many plots at once. With keepDetails the descriptive fields
// (title, site, notes, ...) are left as they are now, so that undoing a
// structural edit does not also undo later, unrecorded typing in the
// details form.
type replaceTrial struct {
	what          string
	before, after *trial.Trial // private copies
	c             change
	keepDetails   bool
}

func (c *replaceTrial) do(t *trial.Trial)   { c.swap(t, c.after) }
func (c *replaceTrial) undo(t *trial.Trial) { c.swap(t, c.before) }
func (c *replaceTrial) kind() change        { return c.c }
func (c *replaceTrial) label() string       { return c.what }

func (c *replaceTrial) swap(t, to *trial.Trial) {
	n := cloneTrial(to)
	if c.keepDetails {
		n.Title, n.Crop, n.Season, n.Site = t.Title, t.Crop, t.Season, t.Site
		n.Investigator, n.Objective, n.Notes = t.Investigator, t.Objective, t.Notes
	}
	*t = *n
}
