package trialfile

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"furlong/trial"
)

// Files of our own beside a trial file NAME.furlong (see DEVELOPERS.md):
//
//	.NAME.furlong.lock   exclusive lock of a read-modify-write or a save;
//	                     removed when the lock is released
//	.NAME.furlong.open   presence marker: the trial is open in a window
//	.fl-HHHH-PID-R.tmp   a save or backup being written (HHHH: a tag of the
//	                     machine, PID: the writer); stale ones are removed
//	                     by the next save in the folder
//	NAME.furlong.bak     the previous version, kept by Save
//
// When NAME is so long that ".NAME.furlong.lock" would not fit in a file
// name, the lock and the presence marker are named ".fl-" followed by 16
// hex digits of a SHA-256 of the name instead.
const (
	lockSuffix     = ".lock"
	presenceSuffix = ".open"
	maxNameLen     = 255 // bytes: the limit of the common file systems
)

// sidecar returns the path of one of our hidden files beside path.
func sidecar(path, suffix string) string {
	dir, base := filepath.Split(path)
	name := "." + base + suffix
	if len(name) > maxNameLen {
		sum := sha256.Sum256([]byte(base))
		name = ".fl-" + hex.EncodeToString(sum[:8]) + suffix
	}
	return filepath.Join(dir, name)
}

// resolve follows symbolic links at path (the final element only, up to
// 40 links, as the operating system does) and returns the path of the real
// file, which need not exist yet. Saving through a link writes its target.
func resolve(path string) (string, error) {
	p := path
	for range 40 {
		fi, err := os.Lstat(p)
		if err != nil || fi.Mode()&os.ModeSymlink == 0 {
			return p, nil
		}
		link, err := os.Readlink(p)
		if err != nil {
			return "", err
		}
		if !filepath.IsAbs(link) {
			link = filepath.Join(filepath.Dir(p), link)
		}
		p = link
	}
	return "", fmt.Errorf("%s is a chain of more than 40 symbolic links: point it at the trial file itself", path)
}

// lockPoll is how often a waiting LockExclusive tries again.
const lockPoll = 20 * time.Millisecond

// LockExclusive takes the exclusive lock of the trial file at path (through
// a symbolic link: the lock belongs to the real file), waiting for another
// holder to release it until ctx is done. Every Save, SaveChecked and
// Update holds this lock while it writes, so a caller that holds it can
// read the file, change it and save it (with saveLocked, through Update)
// without another process writing in between. The lock is an operating
// system lock (flock on Unix, LockFileEx on Windows) on a hidden file
// beside the trial, so it is released when the holder dies; it binds
// processes that take it, not programs that ignore it.
//
// The returned unlock releases the lock; call it exactly once. Within one
// process the lock is not reentrant: taking it twice for one file waits for
// the first holder, as another process would.
func LockExclusive(ctx context.Context, path string) (unlock func() error, err error) {
	target, err := resolve(path)
	if err != nil {
		return nil, err
	}
	return lockFile(ctx, sidecar(target, lockSuffix))
}

// lockFile locks the file name (creating it), removing it on unlock. A
// waiter that locked a file that the previous holder has since removed
// notices (the name no longer leads to the locked file) and tries again.
func lockFile(ctx context.Context, name string) (func() error, error) {
	for {
		f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE, 0o644)
		if err != nil {
			if !beingRemoved(name, err) {
				return nil, folderError(filepath.Dir(name), err)
			}
		} else {
			ok, err := tryLock(f)
			if err != nil {
				f.Close()
				return nil, fmt.Errorf("the trial file could not be locked for saving: %w", err)
			}
			if ok {
				if sameFile(f, name) {
					return func() error { return unlockFile(f, name) }, nil
				}
				releaseLock(f)
			}
			f.Close()
		}
		select {
		case <-ctx.Done():
			return nil, fmt.Errorf("gave up waiting for another program to finish saving the trial: %w", context.Cause(ctx))
		case <-time.After(lockPoll):
		}
	}
}

// sameFile reports whether name still leads to the open file f.
func sameFile(f *os.File, name string) bool {
	a, err := f.Stat()
	if err != nil {
		return false
	}
	b, err := os.Stat(name)
	if err != nil {
		return false
	}
	return os.SameFile(a, b)
}

// unlockFile removes the lock file and then releases the lock, so that a
// waiter which locks the removed file sees that it is gone and starts
// again (Unix). Windows does not remove a file another process holds
// open; there the file is removed after the lock is released, when no one
// else has it open.
func unlockFile(f *os.File, name string) error {
	if removeWhileLocked {
		os.Remove(name)
	}
	err := releaseLock(f)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if !removeWhileLocked {
		os.Remove(name)
	}
	return err
}

// Update is the read-modify-write of a trial file: it takes the exclusive
// lock (LockExclusive; waiting respects ctx), reads the file under the
// lock, calls fn with the trial and, when fn returns nil, saves the trial
// (as Save does) before releasing the lock. An error from fn is returned
// as it is and nothing is written. The file must exist.
func Update(ctx context.Context, path string, fn func(t *trial.Trial) error) error {
	_, err := UpdateIdentity(ctx, path, fn)
	return err
}
