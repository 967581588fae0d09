package ui

import "furlong/trial"

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
	// recovery is where the autosave writes (see App.recoveryPath).
	recovery string
	dirty    bool   // edited since the last explicit save
	gen      uint64 // incremented by every edit
	hist     history

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
