//go:build windows

package ui

import (
	"syscall"
	"unsafe"
)

// folderIDDocuments is FOLDERID_Documents (Microsoft, "KNOWNFOLDERID"):
// the user's Documents folder, wherever it was moved (OneDrive, another
// drive).
var folderIDDocuments = syscall.GUID{Data1: 0xFDD39AD0, Data2: 0x238F, Data3: 0x46AF,
	Data4: [8]byte{0xAD, 0xB4, 0x6C, 0x85, 0x48, 0x03, 0x69, 0xC7}}

// platformDocuments asks Windows (SHGetKnownFolderPath) for the user's
// Documents folder; "" when it cannot say.
func platformDocuments() string {
	shell := syscall.NewLazyDLL("shell32.dll")
	get := shell.NewProc("SHGetKnownFolderPath")
	if get.Find() != nil {
		return ""
	}
	var p *uint16
	r, _, _ := get.Call(uintptr(unsafe.Pointer(&folderIDDocuments)), 0, 0, uintptr(unsafe.Pointer(&p)))
	if p != nil {
		defer syscall.NewLazyDLL("ole32.dll").NewProc("CoTaskMemFree").Call(uintptr(unsafe.Pointer(p)))
	}
	if r != 0 || p == nil {
		return ""
	}
	n := 0
	for q := unsafe.Pointer(p); *(*uint16)(q) != 0; q = unsafe.Add(q, 2) {
		n++
	}
	return syscall.UTF16ToString(unsafe.Slice(p, n))
}
