//go:build windows

package main

import (
	"syscall"
	"unsafe"
)

// furlong.exe is a console program, so that its commands print in cmd and
// PowerShell. Double-clicked, Windows gives it a console of its own; when it
// opens the window it lets go of that console (the box closes at once).
// Started from cmd or PowerShell, the console is shared with the shell and
// stays, so messages still reach it.
func releaseConsole() {
	k := syscall.NewLazyDLL("kernel32.dll")
	list := k.NewProc("GetConsoleProcessList")
	if list.Find() != nil {
		return
	}
	var pids [2]uint32
	n, _, _ := list.Call(uintptr(unsafe.Pointer(&pids[0])), 2)
	if n == 1 { // only this process: the console was made for it
		k.NewProc("FreeConsole").Call()
	}
}
