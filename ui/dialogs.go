package ui

import (
	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/dialog"
)

// closeOnEscape makes Esc close d, as it cancels a dialog elsewhere on the
// desktop. The key reaches the window only while no entry has the focus,
// so the focus is taken from the screen behind the dialog; Esc in one of
// the dialog's own entries stays with that entry. The window's previous
// key handler and focus come back when d closes.
func closeOnEscape(w fyne.Window, d dialog.Dialog) {
	c := w.Canvas()
	prev := c.OnTypedKey()
	focus := c.Focused()
	c.Unfocus()
	c.SetOnTypedKey(func(k *fyne.KeyEvent) {
		if k.Name == fyne.KeyEscape {
			d.Hide()
			return
		}
		if prev != nil {
			prev(k)
		}
	})
	d.SetOnClosed(func() {
		c.SetOnTypedKey(prev)
		if focus != nil {
			c.Focus(focus)
		}
	})
}
