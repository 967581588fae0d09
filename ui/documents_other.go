//go:build !windows

package ui

// platformDocuments is "" outside Windows: file dialogs there start in the
// home folder, where desktops put their own Documents, Downloads... folders.
func platformDocuments() string { return "" }
