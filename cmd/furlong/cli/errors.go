package cli

import (
	"errors"
	"io/fs"
	"path/filepath"
	"strings"
	"syscall"
)

// Message turns an error into the plain words printed after "furlong: ".
// The packages' own errors are written for people already; this adds the
// file-system cases, whose Go wording names system calls.
func Message(err error) string {
	var pe *fs.PathError
	if !errors.As(err, &pe) {
		return err.Error()
	}
	path, dir := pe.Path, filepath.Dir(pe.Path)
	if base := filepath.Base(path); strings.HasPrefix(base, ".") && base != "." && base != ".." {
		// A save's hidden temporary file means nothing to the user: name
		// the folder it was written in.
		path = "the folder " + dir
	}
	switch {
	case errors.Is(err, syscall.ENOSPC):
		return "the disk is full: there is no space left to write in " + dir + "; free some space and try again"
	case errors.Is(err, syscall.EROFS):
		return dir + " is on a read-only disk; copy the trial to a writable folder"
	case errors.Is(err, fs.ErrNotExist):
		return "cannot find " + path + ": check the name and folder"
	case errors.Is(err, fs.ErrPermission):
		return "not allowed to use " + path + ": check the permissions"
	case errors.Is(pe.Err, errIsDir) || strings.Contains(pe.Err.Error(), "is a directory"):
		return path + " is a folder, not a file"
	}
	return "cannot use " + path + ": " + pe.Err.Error()
}

var errIsDir = errors.New("is a directory")
