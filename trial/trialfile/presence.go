package trialfile

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"os/user"
	"path/filepath"
	"time"
)

// A presence marker says that a trial is open in a window: a small JSON
// file ".NAME.furlong.open" beside the trial (see the list of our files in
// lock.go) with who opened it, on which machine, in which process and
// since when. It is a notice for people and for `furlong import`, not a
// lock: nothing refuses to open or save a file because of it.

// presenceStaleAfter: a marker older than this is stale whoever wrote it
// (a machine that went to sleep or crashed with the trial open).
const presenceStaleAfter = 24 * time.Hour

// PresenceInfo describes a presence marker.
type PresenceInfo struct {
	App   string    // the program that wrote it, for example "Furlong 1.2"
	User  string    // the user name of the holder
	Host  string    // the machine's name
	PID   int       // the holder's process id on Host
	Since time.Time // when the trial was opened
	// Stale: the holder's process has ended on this machine, or the
	// marker is older than a day.
	Stale bool
	// Mine: the marker was written by this process.
	Mine bool
}

// String describes the holder in plain words, for a warning.
func (p *PresenceInfo) String() string {
	who := p.User
	if who == "" {
		who = "someone"
	}
	where := p.Host
	if where == "" {
		where = "an unknown machine"
	}
	s := fmt.Sprintf("%s on %s since %s", who, where, p.Since.Local().Format("2 Jan 2006 15:04"))
	if p.Stale {
		s += " (that window seems to have closed without tidying up)"
	}
	return s
}

// presenceFile is the marker's content.
type presenceFile struct {
	App   string `json:"app"`
	User  string `json:"user"`
	Host  string `json:"host"`
	PID   int    `json:"pid"`
	Since string `json:"since"`
}

// Presence is this process's marker on a trial file, from MarkOpen.
type Presence struct {
	path string // the marker file
	own  presenceFile
	// TookOver is the stale marker this one replaced, nil if none.
	TookOver *PresenceInfo
	// Other is the fresh marker of another window that MarkOpen found
	// (the caller should warn); nil if none. Release puts it back if that
	// window is still open.
	Other *PresenceInfo
	other *presenceFile
}

func currentUser() string {
	if u, err := user.Current(); err == nil && u.Username != "" {
		return u.Username
	}
	for _, k := range []string{"USER", "USERNAME", "LOGNAME"} {
		if v := os.Getenv(k); v != "" {
			return v
		}
	}
	return ""
}

// MarkOpen marks the trial file at path as open in a window of app. It
// never refuses because of another marker: a stale marker is replaced
// (Presence.TookOver says whose), and another window's fresh marker is
// replaced too but returned in Presence.Other so the caller can warn;
// Release puts it back while that window is still open. An error means
// only that the marker could not be written (a read-only folder, say);
// the trial can still be opened.
func MarkOpen(path string, app string) (*Presence, error) {
	target, err := resolve(path)
	if err != nil {
		return nil, err
	}
	host, _ := os.Hostname()
	p := &Presence{
		path: sidecar(target, presenceSuffix),
		own: presenceFile{App: app, User: currentUser(), Host: host, PID: os.Getpid(),
			Since: time.Now().UTC().Format(time.RFC3339Nano)},
	}
	prev, raw, err := readPresence(p.path)
	if err != nil && !errors.Is(err, errUnreadablePresence) {
		return nil, err
	}
	switch {
	case prev == nil || prev.Mine:
		// No marker, or opened again by this process: one marker.
	case !prev.Stale:
		p.Other, p.other = prev, raw
	default:
		p.TookOver = prev
	}
	data, _ := json.MarshalIndent(p.own, "", "  ")
	if err := writeSmall(p.path, data); err != nil {
		return nil, err
	}
	return p, nil
}

// Release removes the marker if it is still this process's own. It is
// safe to call more than once and on a nil Presence.
func (p *Presence) Release() error {
	if p == nil || p.path == "" {
		return nil
	}
	name := p.path
	p.path = ""
	data, err := os.ReadFile(name)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	var f presenceFile
	if json.Unmarshal(data, &f) != nil || f != p.own {
		return nil // another window took it over: leave its marker
	}
	if p.other != nil {
		if info := p.other.info(time.Time{}); !info.Stale {
			data, _ := json.MarshalIndent(p.other, "", "  ")
			return writeSmall(name, data)
		}
	}
	if err := os.Remove(name); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	return nil
}

// ReadPresence returns the presence marker of the trial file at path, or
// nil, nil when there is none. A marker that cannot be read as one (cut
// short, say) is reported as stale with what could be read.
func ReadPresence(path string) (*PresenceInfo, error) {
	target, err := resolve(path)
	if err != nil {
		return nil, err
	}
	info, _, err := readPresence(sidecar(target, presenceSuffix))
	if errors.Is(err, errUnreadablePresence) {
		return info, nil
	}
	return info, err
}

var errUnreadablePresence = errors.New("the presence marker cannot be read")

func readPresence(name string) (*PresenceInfo, *presenceFile, error) {
	fi, err := os.Stat(name)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil, nil
	}
	if err != nil {
		return nil, nil, err
	}
	data, err := os.ReadFile(name)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil, nil
	}
	if err != nil {
		return nil, nil, err
	}
	var f presenceFile
	if json.Unmarshal(data, &f) != nil {
		return &PresenceInfo{Since: fi.ModTime(), Stale: true}, nil, errUnreadablePresence
	}
	return f.info(fi.ModTime()), &f, nil
}

// info interprets a marker; mod stands in for an unreadable time.
func (f *presenceFile) info(mod time.Time) *PresenceInfo {
	info := &PresenceInfo{App: f.App, User: f.User, Host: f.Host, PID: f.PID}
	since, err := time.Parse(time.RFC3339Nano, f.Since)
	if err != nil {
		since = mod
	}
	info.Since = since
	host, _ := os.Hostname()
	here := f.Host == host
	info.Mine = here && f.PID == os.Getpid()
	info.Stale = time.Since(since) > presenceStaleAfter || (here && !processAlive(f.PID))
	return info
}

// writeSmall writes a small file atomically (a temporary file renamed
// over name), so a reader never sees half of it.
func writeSmall(name string, data []byte) (err error) {
	dir := filepath.Dir(name)
	f, tmp, err := createTemp(dir)
	if err != nil {
		return folderError(dir, err)
	}
	defer func() {
		if err != nil {
			os.Remove(tmp)
		}
	}()
	if _, err = f.Write(data); err != nil {
		f.Close()
		return saveProblem("the open-trial marker could not be written: %s", err)
	}
	if err = f.Close(); err != nil {
		return saveProblem("the open-trial marker could not be written: %s", err)
	}
	if err = os.Rename(tmp, name); err != nil {
		return saveProblem("the open-trial marker could not be written: %s", err)
	}
	return nil
}
