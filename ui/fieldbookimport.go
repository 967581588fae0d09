package ui

func (u *App) importFieldBookDialog() {}
