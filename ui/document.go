package ui

import (
	"furlong/trial"
	"furlong/trial/trialfile"
)

// change says what an edit touched, so that steps redraw only what they must.
type change int

const (
	changeValues    change = 1 << iota // plot values, exclusions or notes
	changeStructure                    // treatments, traits, design or layout
	changeDetails                      // title and other descriptive fields
	changeFile                         // the file path or saved state
	changeAll       = changeValues | changeStructure | changeDetails | changeFile
)

// document is the open trial with its file and edit history. All its
// methods run on the UI goroutine; background work only ever sees
// snapshots made by cloneTrial.
type document struct {
	t    *trial.Trial
	path string // "" for a trial never saved
	// recovery is where the autosave writes while the trial file cannot
	// be written (see App.recoveryPath): a trial never saved, or one whose
	// file changed on disk until the user decides.
	recovery string
	dirty    bool   // holds edits that are not in the trial file
	gen      uint64 // incremented by every edit
	hist     history

	// epoch tells this document from the ones before it in the window;
	// late reports of the saver and the watcher for another are ignored.
	epoch uint64
	// disk is the identity of the version of the file the window last
	// loaded or wrote, and base that version's content (a private copy):
	// the common ancestor of a three-way merge when the file changes on
	// disk. Zero and nil for a trial never saved.
	disk trialfile.Identity
	base *trial.Trial
	// conflict: the file changed on disk while the window has edits the
	// file lacks; nothing is written to the file until the user chooses
	// (reload, merge, save as); edits go to the recovery copy meanwhile.
	conflict bool
	// presence is the window's open-trial marker beside the file.
	presence *trialfile.Presence
	// stopWatch ends the watcher of the file (nil when none runs).
	stopWatch chan struct{}

	// row is the plot index touched by the edit being reported, or -1
	// when the edit may touch any plot; screens use it to redraw one row.
	row int

	onChange func(change)
}

func newDocument(t *trial.Trial, path string) *document {
	return &document{t: t, path: path, row: -1}
}

// edited records an edit of the given kind and notifies the window.
func (d *document) edited(c change) {
	d.gen++
	d.dirty = true
	if d.onChange != nil {
		d.onChange(c)
	}
}

// apply runs a command, puts it on the undo stack and notifies.
func (d *document) apply(c command) {
	c.do(d.t)
	d.hist.push(c)
	d.notify(c)
}

// notify reports a command's edit with its row hint.
func (d *document) notify(c command) {
	d.row = -1
	if r, ok := c.(interface{ plotRow() int }); ok {
		d.row = r.plotRow()
	}
	d.edited(c.kind())
	d.row = -1
}

// record puts a command that has already been carried out on the undo
// stack and notifies.
func (d *document) record(c command) {
	d.hist.push(c)
	d.notify(c)
}

func (d *document) undo() bool {
	c := d.hist.undo()
	if c == nil {
		return false
	}
	c.undo(d.t)
	d.notify(c)
	return true
}

func (d *document) redo() bool {
	c := d.hist.redo()
	if c == nil {
		return false
	}
	c.do(d.t)
	d.notify(c)
	return true
}

// cloneTrial returns a deep copy of t that shares no mutable memory with
// it, so that the copy can be encoded or analysed on another goroutine
// while the UI keeps editing the original.
func cloneTrial(t *trial.Trial) *trial.Trial { return t.Clone() }
