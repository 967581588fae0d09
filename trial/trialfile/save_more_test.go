package trialfile

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// The save rules below are common practice for programs that replace a
// document on disk (save through a symbolic link, respect read-only files,
// keep temporary names short and clean them up).

func TestSaveThroughSymlink(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	real := filepath.Join(dir, "data", "real.furlong")
	os.Mkdir(filepath.Dir(real), 0o755)
	link := filepath.Join(dir, "link.furlong")
	first, second := richTrial(), richTrial()
	second.Title = "second"
	if err := Save(real, first); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(filepath.Join("data", "real.furlong"), link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	if err := Save(link, second); err != nil {
		t.Fatal(err)
	}
	fi, err := os.Lstat(link)
	if err != nil || fi.Mode()&fs.ModeSymlink == 0 {
		t.Fatalf("the link is no longer a link: %v %v", fi.Mode(), err)
	}
	if got, _ := Load(real); got.Title != "second" {
		t.Errorf("the target holds %q, want the new version", got.Title)
	}
	bfi, err := os.Lstat(link + BackupSuffix)
	if err != nil || !bfi.Mode().IsRegular() {
		t.Fatalf("backup beside the link: %v %v", bfi, err)
	}
	if bak, _ := Load(link + BackupSuffix); bak.Title != first.Title {
		t.Errorf("backup holds %q, want the target's old content", bak.Title)
	}
	// A link to a file that does not exist yet creates the target.
	dangling := filepath.Join(dir, "new-link.furlong")
	os.Symlink(filepath.Join("data", "new.furlong"), dangling)
	if err := Save(dangling, first); err != nil {
		t.Fatal(err)
	}
	if _, err := Load(filepath.Join(dir, "data", "new.furlong")); err != nil {
		t.Errorf("target of a dangling link not written: %v", err)
	}
}

func TestSaveRefusesReadOnlyFile(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "locked.furlong")
	if err := Save(path, richTrial()); err != nil {
		t.Fatal(err)
	}
	os.Chmod(path, 0o444)
	before, _ := os.ReadFile(path)
	other := richTrial()
	other.Title = "other"
	err := Save(path, other)
	if !errors.Is(err, ErrReadOnly) || !strings.Contains(err.Error(), "read-only") || !strings.Contains(err.Error(), "another name") {
		t.Fatalf("got %v, want a read-only refusal", err)
	}
	after, _ := os.ReadFile(path)
	fi, _ := os.Stat(path)
	if string(after) != string(before) || fi.Mode().Perm() != 0o444 {
		t.Error("the read-only file was replaced")
	}
	if _, err := os.Stat(path + BackupSuffix); !errors.Is(err, fs.ErrNotExist) {
		t.Error("a refused save made a backup")
	}
}

func TestSaveOverEmptyFileMakesNoEmptyBackup(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "new.furlong")
	// A file dialog may create the file empty before the first save.
	os.WriteFile(path, nil, 0o644)
	if err := Save(path, richTrial()); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(path + BackupSuffix); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("the first save left a backup of an empty file: %v", err)
	}
}

func TestSaveRemovesStaleTemps(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "t.furlong")
	old := time.Now().Add(-2 * time.Hour)
	files := []struct {
		name    string
		old     bool
		removed bool
	}{
		{fmt.Sprintf(".fl-%s-%d-0a0b0c0d.tmp", hostTag, deadPID(t)), false, true},   // writer gone, this machine
		{".fl-zzzz-1-01020304.tmp", true, true},                                     // another machine, over an hour
		{".fl-zzzz-1-05060708.tmp", false, false},                                   // another machine, recent: may be saving
		{fmt.Sprintf(".fl-%s-%d-11223344.tmp", hostTag, os.Getpid()), false, false}, // this process: a save in progress
		{".t.furlong.saving-12345", true, true},                                     // earlier naming, old
		{".t.furlong.saving-67890", false, false},                                   // earlier naming, recent
		{"t.furlong.bak.new", true, true},
		{"notes.tmp", true, false}, // not ours
	}
	for _, f := range files {
		p := filepath.Join(dir, f.name)
		os.WriteFile(p, []byte("x"), 0o644)
		if f.old {
			os.Chtimes(p, old, old)
		}
	}
	if err := Save(path, richTrial()); err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		_, err := os.Stat(filepath.Join(dir, f.name))
		if gone := errors.Is(err, fs.ErrNotExist); gone != f.removed {
			t.Errorf("%s: removed %v, want %v", f.name, gone, f.removed)
		}
	}
}

func TestSaveLongName(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, n := range []int{240, 244, 255 - len(".furlong")} {
		path := filepath.Join(dir, strings.Repeat("n", n)+".furlong")
		if err := Save(path, richTrial()); err != nil {
			t.Fatalf("name of %d bytes: first save: %v", n+8, err)
		}
		if err := Save(path, richTrial()); err != nil {
			t.Fatalf("name of %d bytes: second save: %v", n+8, err)
		}
		if _, err := Load(path); err != nil {
			t.Fatal(err)
		}
		_, err := os.Stat(path + BackupSuffix)
		if fits := n+8+len(BackupSuffix) <= 255; fits != (err == nil) {
			t.Errorf("name of %d bytes: backup exists %v", n+8, err == nil)
		}
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), ".") {
			t.Errorf("left behind: %s", e.Name())
		}
	}
}

func TestSaveMessages(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "big.furlong")
	if err := Save(path, bigTrial("old", 2000, 3, 0)); err != nil {
		t.Fatal(err)
	}
	_, err := save(path, bigTrial("new", 2000, 3, 1), func(w io.Writer) io.Writer { return &failAfter{w: w, n: 1000} })
	msg := fmt.Sprint(err)
	if !errors.Is(err, syscall.ENOSPC) || strings.Contains(msg, tempPrefix) || !strings.Contains(msg, "disk is full") || !strings.Contains(msg, "big.furlong was left unchanged") {
		t.Errorf("disk full: %q", msg)
	}
	// A new file on a full disk says no file was written.
	_, err = save(filepath.Join(dir, "fresh.furlong"), richTrial(), func(w io.Writer) io.Writer { return &failAfter{w: w, n: 10} })
	if msg := fmt.Sprint(err); !strings.Contains(msg, "no file was written") || strings.Contains(msg, tempPrefix) {
		t.Errorf("disk full, new file: %q", msg)
	}

	// A folder that forbids writing is named as a folder, with its path.
	for _, d := range []string{".", dir} {
		err := folderError(d, &fs.PathError{Op: "open", Path: filepath.Join(d, ".fl-abcd-1-00000000.tmp"), Err: syscall.EACCES})
		abs, _ := filepath.Abs(d)
		msg := err.Error()
		if !strings.Contains(msg, "the folder "+abs+" ") || strings.Contains(msg, tempPrefix) || !errors.Is(err, fs.ErrPermission) {
			t.Errorf("read-only folder %q: %q", d, msg)
		}
	}
	if os.Geteuid() != 0 { // root may write anywhere
		ro := filepath.Join(dir, "ro")
		os.Mkdir(ro, 0o555)
		err := Save(filepath.Join(ro, "t.furlong"), richTrial())
		if msg := fmt.Sprint(err); !strings.Contains(msg, "the folder "+ro) || !strings.Contains(msg, "permission denied") {
			t.Errorf("read-only folder: %q", msg)
		}
	}
}
