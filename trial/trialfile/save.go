package trialfile

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"

	"furlong/trial"
)

// BackupSuffix is appended to a trial file's name for the copy of the
// previous version that Save keeps beside it.
const BackupSuffix = ".bak"

// Load reads the trial file at path.
func Load(path string) (*trial.Trial, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	t, err := Decode(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", filepath.Base(path), err)
	}
	return t, nil
}

// Save writes t to path so that a crash or a full disk at any moment leaves
// either the previous file or the new one at path, never a mixture: the
// trial is written to a temporary file in the same folder and flushed to
// disk, the previous file is kept as path+BackupSuffix, and the temporary
// file is then renamed over path and the folder flushed.
func Save(path string, t *trial.Trial) error {
	return save(path, t, nil)
}

// save is Save with a hook that wraps the temporary file's writer (tests
// use it to simulate a full disk).
func save(path string, t *trial.Trial, wrap func(io.Writer) io.Writer) (err error) {
	data, err := marshal(t)
	if err != nil {
		return err
	}
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	mode := fs.FileMode(0o644)
	old, statErr := os.Stat(path)
	if statErr == nil {
		if !old.Mode().IsRegular() {
			return fmt.Errorf("%s is not a regular file", path)
		}
		mode = old.Mode().Perm()
	}

	tmp, err := os.CreateTemp(dir, "."+base+".saving-*")
	if err != nil {
		// The temporary file's name means nothing to the user: name the
		// folder the trial was to be saved in.
		var pe *fs.PathError
		if errors.As(err, &pe) {
			pe.Path = filepath.Clean(dir)
			pe.Op = "save in"
		}
		return err
	}
	tmpName := tmp.Name()
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmpName)
		}
	}()
	var w io.Writer = tmp
	if wrap != nil {
		w = wrap(w)
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	if _, err = bw.Write(data); err != nil {
		return fmt.Errorf("the trial could not be saved: %w", err)
	}
	if err = bw.Flush(); err != nil {
		return fmt.Errorf("the trial could not be saved: %w", err)
	}
	if err = tmp.Sync(); err != nil {
		return fmt.Errorf("the trial could not be saved: %w", err)
	}
	if err = tmp.Chmod(mode); err != nil && runtime.GOOS != "windows" {
		return err
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("the trial could not be saved: %w", err)
	}
	if statErr == nil {
		if err = backup(path); err != nil {
			return fmt.Errorf("the previous version could not be kept as a backup: %w", err)
		}
	}
	if err = os.Rename(tmpName, path); err != nil {
		return err
	}
	return syncDir(dir)
}

// backup makes path+BackupSuffix a copy of path, replacing the old backup
// atomically: a hard link under a temporary name renamed over the backup,
// or a flushed copy where the file system has no hard links.
func backup(path string) error {
	bak := path + BackupSuffix
	tmp := bak + ".new"
	os.Remove(tmp)
	if err := os.Link(path, tmp); err != nil {
		if err := copyFile(path, tmp); err != nil {
			os.Remove(tmp)
			return err
		}
	}
	err := os.Rename(tmp, bak)
	// Renaming a hard link over another link to the same file does
	// nothing, which leaves tmp behind (after an interrupted save).
	os.Remove(tmp)
	return err
}

func copyFile(src, dst string) error {
	in, err := os.Open(src)
	if err != nil {
		return err
	}
	defer in.Close()
	out, err := os.OpenFile(dst, os.O_WRONLY|os.O_CREATE|os.O_TRUNC, 0o644)
	if err != nil {
		return err
	}
	if _, err := io.Copy(out, in); err != nil {
		out.Close()
		return err
	}
	if err := out.Sync(); err != nil {
		out.Close()
		return err
	}
	return out.Close()
}

// syncDir flushes a folder's entries (the renames) to disk. Windows cannot
// open folders for flushing; there the rename is left to the file system.
func syncDir(dir string) error {
	if runtime.GOOS == "windows" {
		return nil
	}
	d, err := os.Open(dir)
	if err != nil {
		return err
	}
	err = d.Sync()
	if cerr := d.Close(); err == nil {
		err = cerr
	}
	if err != nil && !errors.Is(err, os.ErrInvalid) {
		return err
	}
	return nil
}
