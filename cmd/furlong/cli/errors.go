package cli

import (
	"errors"
	"io/fs"
	"strings"
)

// Message turns an error into the plain words printed after "furlong: ".
// The packages' own errors are written for people already; this adds the
// file-system cases, whose Go wording names system calls.
func Message(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		switch {
		case errors.Is(err, fs.ErrNotExist):
			return "cannot find " + pe.Path + ": check the name and folder"
		case errors.Is(err, fs.ErrPermission):
			return "not allowed to use " + pe.Path + ": check the file's permissions"
		case errors.Is(pe.Err, errIsDir) || strings.Contains(pe.Err.Error(), "is a directory"):
			return pe.Path + " is a folder, not a file"
		}
		return "cannot use " + pe.Path + ": " + pe.Err.Error()
	}
	return err.Error()
}

var errIsDir = errors.New("is a directory")
