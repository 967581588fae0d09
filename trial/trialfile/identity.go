package trialfile

import (
	"bytes"
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"furlong/trial"
)

// Identity tells one version of a trial file from another: its size, its
// modification time and a SHA-256 hash of its bytes. Two identities are the
// same version when Same says so; the time is for display (a copy or a
// sync client may change it without changing the content).
type Identity struct {
	Size    int64
	ModTime time.Time
	Hash    [32]byte // SHA-256 of the file's bytes
}

// Same reports whether a and b are the same content: the size and the hash
// decide, the modification time does not.
func (a Identity) Same(b Identity) bool { return a.Size == b.Size && a.Hash == b.Hash }

// IsZero reports whether a is the zero Identity (no file).
func (a Identity) IsZero() bool { return a == Identity{} }

// String gives the first hex digits of the hash and the size, for logs.
func (a Identity) String() string {
	if a.IsZero() {
		return "no file"
	}
	return fmt.Sprintf("%x… (%d bytes)", a.Hash[:6], a.Size)
}

func identityOf(data []byte, mod time.Time) Identity {
	return Identity{Size: int64(len(data)), ModTime: mod, Hash: sha256.Sum256(data)}
}

// Stat returns the identity of the file at path as it is now. It reads the
// whole file to hash it. A file that does not exist is an error wrapping
// fs.ErrNotExist.
func Stat(path string) (Identity, error) {
	_, id, err := readFile(path)
	return id, err
}

// readFile reads path and returns its bytes with their identity.
func readFile(path string) ([]byte, Identity, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, Identity{}, err
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil {
		return nil, Identity{}, err
	}
	if !fi.Mode().IsRegular() {
		return nil, Identity{}, fmt.Errorf("%s is not a regular file", path)
	}
	var buf bytes.Buffer
	if fi.Size() > 0 && fi.Size() < 1<<31 {
		buf.Grow(int(fi.Size()) + 1)
	}
	if _, err := buf.ReadFrom(f); err != nil {
		return nil, Identity{}, err
	}
	return buf.Bytes(), identityOf(buf.Bytes(), fi.ModTime()), nil
}

// LoadIdentity reads the trial file at path and returns the trial with the
// identity of exactly the bytes it decoded, for a later SaveChecked.
func LoadIdentity(path string) (*trial.Trial, Identity, error) {
	data, id, err := readFile(path)
	if err != nil {
		return nil, Identity{}, err
	}
	t, err := decode(data)
	if err != nil {
		return nil, Identity{}, fmt.Errorf("%s: %w", filepath.Base(path), err)
	}
	return t, id, nil
}

// ErrChangedOnDisk is wrapped by the error of SaveChecked when the file on
// disk is no longer the version the caller expected.
var ErrChangedOnDisk = errors.New("the trial file was changed by another program")

// ChangedError is the error of SaveChecked when the file on disk is not
// the expected version. It wraps ErrChangedOnDisk.
type ChangedError struct {
	Path string
	// Want is the identity the caller expected, Got the file's identity now
	// (zero when the file no longer exists).
	Want, Got Identity
}

// Error implements the error interface.
func (e *ChangedError) Error() string {
	switch {
	case e.Got.IsZero():
		return fmt.Sprintf("%s was removed or renamed by another program since it was opened; nothing was saved", e.Path)
	case e.Want.IsZero():
		return fmt.Sprintf("%s was created by another program in the meantime; nothing was saved over it", e.Path)
	}
	return fmt.Sprintf("%s was changed by another program since it was opened; nothing was saved over it", e.Path)
}

// Unwrap returns ErrChangedOnDisk.
func (e *ChangedError) Unwrap() error { return ErrChangedOnDisk }

// SaveChecked saves t to path as Save does, but only if the file on disk is
// still the version expect (Identity.Same). A zero expect means "a new
// file": the save goes ahead only when no file exists at path. Otherwise it
// writes nothing and returns an error wrapping ErrChangedOnDisk (a
// *ChangedError with the identity found). The check and the write happen
// under the exclusive lock (LockExclusive), so no other saver can slip in
// between. It returns the identity of the file it wrote.
func SaveChecked(path string, t *trial.Trial, expect Identity) (Identity, error) {
	data, err := marshal(t)
	if err != nil {
		return Identity{}, err
	}
	unlock, err := LockExclusive(context.Background(), path)
	if err != nil {
		return Identity{}, err
	}
	defer unlock()
	target, err := resolve(path)
	if err != nil {
		return Identity{}, err
	}
	got, err := Stat(target)
	if err != nil && !errors.Is(err, os.ErrNotExist) {
		return Identity{}, err
	}
	if !got.Same(expect) || got.IsZero() != expect.IsZero() {
		return Identity{}, &ChangedError{Path: path, Want: expect, Got: got}
	}
	return writeLocked(path, data, nil)
}

// UpdateIdentity is Update that also returns the identity of the file it
// wrote (zero when fn returned an error).
func UpdateIdentity(ctx context.Context, path string, fn func(t *trial.Trial) error) (Identity, error) {
	unlock, err := LockExclusive(ctx, path)
	if err != nil {
		return Identity{}, err
	}
	defer unlock()
	t, _, err := LoadIdentity(path)
	if err != nil {
		return Identity{}, err
	}
	if err := fn(t); err != nil {
		return Identity{}, err
	}
	data, err := marshal(t)
	if err != nil {
		return Identity{}, err
	}
	return writeLocked(path, data, nil)
}
