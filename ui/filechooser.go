package ui

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/layout"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"
)

// chooseOptions describe one use of the file chooser.
type chooseOptions struct {
	title   string   // "Open a trial", "Save the trial as"
	save    bool     // choosing a new file name rather than an existing file
	exts    []string // lower-case endings listed (".furlong"); the first is added to a name typed without one
	name    string   // the file name proposed when saving
	confirm string   // the button that chooses ("Open", "Save")
}

// fileChooser is Furlong's own file dialog. Unlike Fyne's it takes a typed
// path (a file name, a path relative to the folder shown, a full path or
// ~/...), both to open and to save; a single click selects, a double
// click opens a folder or chooses a file, and the second click of a double
// click never lands on whatever appears in the folder just opened.
type fileChooser struct {
	u    *App
	o    chooseOptions
	done func(path string)

	dir     string
	entries []chooserEntry
	sel     int // selected entry, -1 for none

	folder *widget.Entry // the folder shown; a typed folder and Enter go there
	list   *widget.List
	name   *widget.Entry // a name or a path
	note   *widget.Label // what is wrong with the typed name, in words
	ok     *widget.Button
	d      *dialog.CustomDialog
}

// chooserEntry is one line of the list.
type chooserEntry struct {
	name string
	dir  bool
}

// chooseFile shows the chooser; done receives the absolute path chosen
// (for a save, with its ending and after any replace question). The
// folder starts at the last one used.
func (u *App) chooseFile(o chooseOptions, done func(path string)) *fileChooser {
	c := &fileChooser{u: u, o: o, done: done, sel: -1}
	c.folder = widget.NewEntry()
	c.folder.OnSubmitted = func(s string) { c.goTo(c.resolve(s)) }
	up := widget.NewButtonWithIcon("", theme.MoveUpIcon(), func() { c.goTo(filepath.Dir(c.dir)) })
	home := widget.NewButtonWithIcon("", theme.HomeIcon(), func() {
		if h, err := os.UserHomeDir(); err == nil {
			c.goTo(h)
		}
	})
	c.list = widget.NewList(func() int { return len(c.entries) },
		func() fyne.CanvasObject { return newChooserRow(c) },
		func(id widget.ListItemID, o fyne.CanvasObject) { o.(*chooserRow).set(id) })
	c.name = widget.NewEntry()
	c.name.SetPlaceHolder("a file name, or a full path")
	c.name.OnSubmitted = func(string) { c.submit() }
	c.name.OnChanged = func(string) { c.note.SetText("") }
	c.note = widget.NewLabel("")
	c.note.Wrapping = fyne.TextWrapWord
	c.note.Importance = widget.DangerImportance
	confirm := o.confirm
	if confirm == "" {
		confirm = "Open"
		if o.save {
			confirm = "Save"
		}
	}
	c.ok = widget.NewButton(confirm, c.submit)
	c.ok.Importance = widget.HighImportance
	cancel := widget.NewButton("Cancel", func() { c.d.Hide() })

	label := "File to open"
	if o.save {
		label = "Save as"
	}
	top := container.NewBorder(nil, nil, container.NewHBox(widget.NewLabel("Folder"), up, home), nil, c.folder)
	nameRow := container.NewBorder(nil, nil, widget.NewLabel(label), nil, c.name)
	hint := widget.NewLabel(c.hint())
	hint.Importance = widget.LowImportance
	hint.Wrapping = fyne.TextWrapWord
	bottom := container.NewVBox(nameRow, hint, c.note, container.NewHBox(layout.NewSpacer(), cancel, c.ok))
	body := container.NewBorder(top, bottom, nil, nil, c.list)
	c.d = dialog.NewCustomWithoutButtons(o.title, body, u.win)
	c.d.Resize(dialogSize(u.win))

	if o.save {
		c.name.SetText(o.name)
	}
	c.goTo(c.startFolder())
	c.d.Show()
	closeOnEscape(u.win, c.d)
	u.win.Canvas().Focus(c.name)
	return c
}

// hint says what may be typed.
func (c *fileChooser) hint() string {
	kinds := "files"
	if len(c.o.exts) > 0 {
		kinds = strings.Join(c.o.exts, ", ") + " files"
	}
	if c.o.save {
		return "Type a name, or a path such as ~/trials/plan" + c.ext() + ". Double-click a folder to open it. " +
			"A name without an ending gets " + c.ext() + "."
	}
	return "Double-click a file or a folder, or type a path and press Enter. Only folders and " + kinds + " are listed."
}

// ext is the ending added to a name typed without one.
func (c *fileChooser) ext() string {
	if len(c.o.exts) == 0 {
		return ""
	}
	return c.o.exts[0]
}

// documentsFolder is the user's Documents folder on Windows, "" elsewhere
// (a variable so that tests can stand in for Windows).
var documentsFolder = platformDocuments

// startFolder is the last folder used, else the user's Documents folder
// (Windows), else the home folder, else the working folder.
func (c *fileChooser) startFolder() string {
	isDir := func(d string) bool {
		fi, err := os.Stat(d)
		return d != "" && err == nil && fi.IsDir()
	}
	if d := c.u.prefs.lastFolder; isDir(d) {
		return d
	}
	if d := documentsFolder(); isDir(d) {
		return d
	}
	if h, err := os.UserHomeDir(); err == nil {
		return h
	}
	d, _ := os.Getwd()
	return d
}

// resolve turns what was typed into an absolute path: ~ is the home
// folder, a relative path is taken from the folder shown.
func (c *fileChooser) resolve(s string) string {
	s = strings.TrimSpace(s)
	if s == "~" || strings.HasPrefix(s, "~/") || strings.HasPrefix(s, `~\`) {
		if h, err := os.UserHomeDir(); err == nil {
			s = filepath.Join(h, s[1:])
		}
	}
	if !filepath.IsAbs(s) {
		s = filepath.Join(c.dir, s)
	}
	return filepath.Clean(s)
}

// goTo shows the folder dir; a folder that cannot be listed is explained
// in the dialog and the folder shown stays.
func (c *fileChooser) goTo(dir string) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		c.folder.SetText(c.dir)
		switch {
		case errors.Is(err, fs.ErrNotExist):
			c.note.SetText("There is no folder " + dir + ". Check the path, or go up and pick a folder from the list.")
		case errors.Is(err, fs.ErrPermission):
			c.note.SetText("You may not look into the folder " + dir + ". Pick another folder.")
		default:
			c.note.SetText("The folder " + dir + " cannot be listed. Pick another folder.")
		}
		return
	}
	c.dir = dir
	c.folder.SetText(dir)
	c.entries = c.entries[:0]
	for _, e := range ents {
		n := e.Name()
		if strings.HasPrefix(n, ".") {
			continue // hidden files, and Furlong's own markers and temporary files
		}
		isDir := e.IsDir()
		if e.Type()&fs.ModeSymlink != 0 {
			if fi, err := os.Stat(filepath.Join(dir, n)); err == nil {
				isDir = fi.IsDir()
			}
		}
		if !isDir && len(c.o.exts) > 0 && !slices.Contains(c.o.exts, strings.ToLower(filepath.Ext(n))) {
			continue
		}
		c.entries = append(c.entries, chooserEntry{name: n, dir: isDir})
	}
	slices.SortFunc(c.entries, func(a, b chooserEntry) int {
		if a.dir != b.dir {
			if a.dir {
				return -1
			}
			return 1
		}
		return strings.Compare(strings.ToLower(a.name), strings.ToLower(b.name))
	})
	c.sel = -1
	c.list.UnselectAll()
	c.list.ScrollToTop()
	c.list.Refresh()
	c.note.SetText("")
}

// tap selects an entry: a file's name goes into the name field.
func (c *fileChooser) tap(id int) {
	if id < 0 || id >= len(c.entries) {
		return
	}
	c.sel = id
	c.list.Select(id)
	if !c.entries[id].dir {
		c.name.SetText(c.entries[id].name)
	}
}

// activate is a double click: a folder opens, a file is chosen.
func (c *fileChooser) activate(id int) {
	if id < 0 || id >= len(c.entries) {
		return
	}
	e := c.entries[id]
	if e.dir {
		c.goTo(filepath.Join(c.dir, e.name))
		return
	}
	c.name.SetText(e.name)
	c.submit()
}

// submit chooses what the name field says (or opens the folder selected
// when it is empty). Problems are said in the dialog, which stays open.
func (c *fileChooser) submit() {
	typed := strings.TrimSpace(c.name.Text)
	if typed == "" {
		if c.sel >= 0 && c.sel < len(c.entries) && c.entries[c.sel].dir {
			c.goTo(filepath.Join(c.dir, c.entries[c.sel].name))
			return
		}
		if c.o.save {
			c.note.SetText("Type a name for the file.")
		} else {
			c.note.SetText("Pick a file from the list, or type its path.")
		}
		return
	}
	p := c.resolve(typed)
	if fi, err := os.Stat(p); err == nil && fi.IsDir() {
		// A folder typed or picked: show it, keep the name to save under.
		c.goTo(p)
		if !c.o.save {
			c.name.SetText("")
		} else {
			c.name.SetText(c.o.name)
		}
		return
	}
	if c.o.save {
		c.chooseSave(p)
		return
	}
	if _, err := os.Stat(p); err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			c.note.SetText("There is no file " + filepath.Base(p) + " in " + filepath.Dir(p) + ". Check the name, or pick the file from the list.")
		} else {
			c.note.SetText("The file " + p + " cannot be read. Pick another file.")
		}
		return
	}
	c.finish(p)
}

// chooseSave checks the save path p: its ending, its folder, and asks
// before replacing a file.
func (c *fileChooser) chooseSave(p string) {
	if ext := c.ext(); ext != "" && !slices.Contains(c.o.exts, strings.ToLower(filepath.Ext(p))) {
		p += ext
	}
	dir := filepath.Dir(p)
	if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
		c.note.SetText("There is no folder " + dir + ". Create it first, or pick a folder from the list and type only the name.")
		return
	}
	fi, err := os.Stat(p)
	if err != nil {
		c.finish(p)
		return
	}
	if fi.IsDir() {
		c.note.SetText(filepath.Base(p) + " is a folder. Type another name.")
		return
	}
	dialog.ShowConfirm("Replace the file?", "A file "+filepath.Base(p)+" already exists in "+dir+
		".\n\nReplace it?", func(ok bool) {
		if ok {
			c.finish(p)
		}
	}, c.u.win)
}

// finish closes the dialog, remembers the folder and hands over p.
func (c *fileChooser) finish(p string) {
	c.d.Hide()
	c.u.prefs.onLastFolderChanged(filepath.Dir(p))
	if c.done != nil {
		c.done(p)
	}
}

// chooserRow is one line of the chooser's list. It takes single and
// double clicks itself: the driver then holds a single click back until
// the double-click delay has passed, so a double click is one event.
type chooserRow struct {
	widget.BaseWidget
	c     *fileChooser
	id    int
	icon  *widget.Icon
	label *widget.Label
}

func newChooserRow(c *fileChooser) *chooserRow {
	r := &chooserRow{c: c, icon: widget.NewIcon(theme.FileIcon()), label: widget.NewLabel("")}
	r.label.Truncation = fyne.TextTruncateEllipsis
	r.ExtendBaseWidget(r)
	return r
}

func (r *chooserRow) set(id int) {
	r.id = id
	e := r.c.entries[id]
	if e.dir {
		r.icon.SetResource(theme.FolderIcon())
		r.label.SetText(e.name + string(filepath.Separator))
	} else {
		r.icon.SetResource(theme.FileIcon())
		r.label.SetText(e.name)
	}
}

// CreateRenderer implements fyne.Widget.
func (r *chooserRow) CreateRenderer() fyne.WidgetRenderer {
	return widget.NewSimpleRenderer(container.NewBorder(nil, nil, r.icon, nil, r.label))
}

// Tapped selects the line.
func (r *chooserRow) Tapped(*fyne.PointEvent) { r.c.tap(r.id) }

// DoubleTapped opens the folder or chooses the file.
func (r *chooserRow) DoubleTapped(*fyne.PointEvent) { r.c.activate(r.id) }
