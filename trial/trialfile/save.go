package trialfile

import (
	"bufio"
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"time"

	"furlong/trial"
)

// BackupSuffix is appended to a trial file's name for the copy of the
// previous version that Save keeps beside it.
const BackupSuffix = ".bak"

// ErrReadOnly is wrapped by the error of a save to a trial file that is
// marked read-only: Furlong does not replace it.
var ErrReadOnly = errors.New("the trial file is read-only")

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
// file is then renamed over path and the folder flushed. All of it happens
// under the exclusive lock (LockExclusive).
//
// A path that is a symbolic link is saved through the link: the target is
// replaced, the link stays, and the backup beside the link holds the
// target's previous content. A file marked read-only is not replaced (the
// error wraps ErrReadOnly). An existing empty file (as a file dialog may
// create) is not kept as a backup. Temporary files of earlier saves that
// were killed are removed. When the backup's name would be too long for
// the folder, the file is saved without a backup.
func Save(path string, t *trial.Trial) error {
	_, err := save(path, t, nil)
	return err
}

// save is Save with a hook that wraps the temporary file's writer (tests
// use it to simulate a full disk).
func save(path string, t *trial.Trial, wrap func(io.Writer) io.Writer) (Identity, error) {
	data, err := marshal(t)
	if err != nil {
		return Identity{}, err
	}
	unlock, err := LockExclusive(context.Background(), path)
	if err != nil {
		return Identity{}, err
	}
	defer unlock()
	return writeLocked(path, data, wrap)
}

// writeLocked writes data to path atomically; the caller holds the lock.
func writeLocked(path string, data []byte, wrap func(io.Writer) io.Writer) (_ Identity, err error) {
	target, err := resolve(path)
	if err != nil {
		return Identity{}, err
	}
	dir := filepath.Dir(target)
	mode := fs.FileMode(0o644)
	old, statErr := os.Stat(target)
	switch {
	case statErr == nil:
		if !old.Mode().IsRegular() {
			return Identity{}, fmt.Errorf("%s is not a regular file, so the trial was not saved there: choose another name", path)
		}
		mode = old.Mode().Perm()
		if mode&0o200 == 0 {
			return Identity{}, fmt.Errorf("%w: %s is marked read-only, so it was not replaced; make it writable or save the trial under another name", ErrReadOnly, path)
		}
	case !errors.Is(statErr, fs.ErrNotExist):
		return Identity{}, folderError(dir, statErr)
	}
	removeStaleTemps(dir, time.Now())

	tmp, tmpName, err := createTemp(dir)
	if err != nil {
		return Identity{}, folderError(dir, err)
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmpName)
		}
	}()
	unchanged := func(err error) error {
		if statErr == nil {
			return saveProblem(fmt.Sprintf("the trial could not be saved: %%s; %s was left unchanged", filepath.Base(path)), err)
		}
		return saveProblem("the trial could not be saved: %s; no file was written", err)
	}
	var w io.Writer = tmp
	if wrap != nil {
		w = wrap(w)
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	if _, err = bw.Write(data); err != nil {
		return Identity{}, unchanged(err)
	}
	if err = bw.Flush(); err != nil {
		return Identity{}, unchanged(err)
	}
	if err = tmp.Sync(); err != nil {
		return Identity{}, unchanged(err)
	}
	if err = tmp.Chmod(mode); err != nil && runtime.GOOS != "windows" {
		return Identity{}, unchanged(err)
	}
	if err = tmp.Close(); err != nil {
		return Identity{}, unchanged(err)
	}
	if statErr == nil && old.Size() > 0 {
		if err = backup(target, path+BackupSuffix); err != nil && !errors.Is(err, syscall.ENAMETOOLONG) {
			return Identity{}, saveProblem(fmt.Sprintf("the previous version could not be kept as a backup (%%s), so %s was left unchanged", filepath.Base(path)), err)
		}
	}
	if err = os.Rename(tmpName, target); err != nil {
		return Identity{}, unchanged(err)
	}
	if err = syncDir(dir); err != nil {
		return Identity{}, err
	}
	mod := time.Now()
	if fi, err := os.Stat(target); err == nil {
		mod = fi.ModTime()
	}
	return identityOf(data, mod), nil
}

// Temporary files are named ".fl-HHHH-PID-RRRRRRRR.tmp": a tag of the
// machine's name, the writer's process id and random letters. The name is
// short whatever the trial's name, so a trial whose name is near the
// folder's limit can still be saved.
const (
	tempPrefix = ".fl-"
	tempSuffix = ".tmp"
	// staleAfter: a temporary file this old is left over from a save that
	// was killed, whichever machine wrote it.
	staleAfter = time.Hour
)

var hostTag = func() string {
	h, _ := os.Hostname()
	sum := sha256.Sum256([]byte(h))
	return hex.EncodeToString(sum[:2])
}()

func createTemp(dir string) (*os.File, string, error) {
	for range 100 {
		var r [4]byte
		rand.Read(r[:])
		name := filepath.Join(dir, tempPrefix+hostTag+"-"+strconv.Itoa(os.Getpid())+"-"+hex.EncodeToString(r[:])+tempSuffix)
		f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o600)
		if errors.Is(err, fs.ErrExist) {
			continue
		}
		return f, name, err
	}
	return nil, "", fmt.Errorf("could not find a free name for a temporary file in %s", dir)
}

// removeStaleTemps removes temporary files of our own naming in dir that a
// killed save left behind: those written on this machine by a process
// that has ended, and any older than staleAfter. Files of the earlier
// naming (".NAME.saving-*", "NAME.bak.new") go by age only.
func removeStaleTemps(dir string, now time.Time) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return
	}
	for _, e := range entries {
		name := e.Name()
		ours := strings.HasPrefix(name, tempPrefix) && strings.HasSuffix(name, tempSuffix)
		legacy := (strings.HasPrefix(name, ".") && strings.Contains(name, ".saving-")) || strings.HasSuffix(name, BackupSuffix+".new")
		if !ours && !legacy || !e.Type().IsRegular() {
			continue
		}
		fi, err := e.Info()
		if err != nil {
			continue
		}
		stale := now.Sub(fi.ModTime()) > staleAfter
		if ours && !stale {
			parts := strings.Split(strings.TrimSuffix(strings.TrimPrefix(name, tempPrefix), tempSuffix), "-")
			if len(parts) == 3 && parts[0] == hostTag {
				if pid, err := strconv.Atoi(parts[1]); err == nil && !processAlive(pid) {
					stale = true
				}
			}
		}
		if stale {
			os.Remove(filepath.Join(dir, name))
		}
	}
}

// backup makes bak a copy of target, replacing the old backup atomically:
// a hard link under a temporary name renamed over the backup, or a flushed
// copy where the file system has no hard links (or bak is on another one).
func backup(target, bak string) error {
	dir := filepath.Dir(bak)
	f, tmp, err := createTemp(dir)
	if err != nil {
		return err
	}
	f.Close()
	os.Remove(tmp)
	if err := os.Link(target, tmp); err != nil {
		if err := copyFile(target, tmp); err != nil {
			os.Remove(tmp)
			return err
		}
	}
	err = os.Rename(tmp, bak)
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
	out, err := os.OpenFile(dst, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
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

// ioProblem is a plain message about a failed file operation that still
// wraps the system's error (errors.Is(err, syscall.ENOSPC) holds).
type ioProblem struct {
	msg string
	err error
}

func (e *ioProblem) Error() string { return e.msg }
func (e *ioProblem) Unwrap() error { return e.err }

// plainReason words a system error without the name of the file it was
// about (a hidden temporary file means nothing to the user).
func plainReason(err error) string {
	var pe *fs.PathError
	var le *os.LinkError
	inner := err
	switch {
	case errors.As(err, &pe):
		inner = pe.Err
	case errors.As(err, &le):
		inner = le.Err
	}
	switch {
	case errors.Is(inner, syscall.ENOSPC):
		return "the disk is full"
	case errors.Is(inner, syscall.EDQUOT):
		return "your share of the disk (quota) is used up"
	case errors.Is(inner, syscall.EROFS):
		return "the disk is read-only"
	case errors.Is(inner, fs.ErrPermission):
		return "permission denied"
	case errors.Is(inner, syscall.ENAMETOOLONG):
		return "the name is too long for the folder"
	}
	return inner.Error()
}

// saveProblem formats msg (with one %s for the reason) around err.
func saveProblem(msg string, err error) error {
	return &ioProblem{msg: fmt.Sprintf(msg, plainReason(err)), err: err}
}

// folderError words a failure to create a file in dir: it names the folder
// as a folder, with its full path.
func folderError(dir string, err error) error {
	if abs, aerr := filepath.Abs(dir); aerr == nil {
		dir = abs
	}
	var msg string
	switch {
	case errors.Is(err, fs.ErrNotExist):
		msg = fmt.Sprintf("the folder %s does not exist: choose another folder", dir)
	case errors.Is(err, fs.ErrPermission):
		msg = fmt.Sprintf("the folder %s does not allow saving files (permission denied): choose another folder or ask for write access", dir)
	case errors.Is(err, syscall.EROFS):
		msg = fmt.Sprintf("the folder %s is on a read-only disk: choose another folder", dir)
	case errors.Is(err, syscall.ENOSPC):
		msg = fmt.Sprintf("the disk of the folder %s is full: make room and save again; nothing was changed", dir)
	default:
		msg = fmt.Sprintf("could not save in the folder %s: %s", dir, plainReason(err))
	}
	return &ioProblem{msg: msg, err: err}
}
