package series

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"time"

	stseries "furlong/stats/series"
)

// FileFormat is the value of the "format" key of a series file.
const FileFormat = "furlong-series"

// FileVersion is the schema version Encode writes; Decode reads it and
// every older one.
const FileVersion = 1

// FileExt is the usual extension of a series file.
const FileExt = ".furlong-series"

// Weighting names how the two-stage analysis weights the site means.
const (
	WeightNone   = "none"    // unweighted (the default)
	WeightStage1 = "stage-1" // each site mean weighted by the inverse of its stage-1 variance
)

// Series is a trial series as kept in a series file: its name, its trials
// and the options of its analysis.
type Series struct {
	Name    string
	Trials  []TrialRef
	Options FileOptions
}

// TrialRef is one trial of a series: its path (relative to the series
// file's folder where possible, with forward slashes) and the identity of
// the file when it was added, so that a later reading can say it changed.
type TrialRef struct {
	Path    string
	Size    int64
	ModTime time.Time
	SHA256  string // hex; "" when not known
}

// FileOptions are the analysis options a series remembers.
type FileOptions struct {
	Trait     string // trait key; "" for every trait the trials share
	Check     string // check treatment code; "" for the trials' own check
	Sites     string // "random" (default) or "fixed"
	Weighting string // WeightNone (default) or WeightStage1
}

type fileJSON struct {
	Format  string      `json:"format"`
	Version int         `json:"version"`
	Name    string      `json:"name"`
	Trials  []trialJSON `json:"trials"`
	Options optionsJSON `json:"options"`
}

type trialJSON struct {
	Path     string `json:"path"`
	Size     int64  `json:"size,omitempty"`
	Modified string `json:"modified,omitempty"`
	SHA256   string `json:"sha256,omitempty"`
}

type optionsJSON struct {
	Trait     string `json:"trait,omitempty"`
	Check     string `json:"check,omitempty"`
	Sites     string `json:"sites,omitempty"`
	Weighting string `json:"weighting,omitempty"`
}

// ParseSites reads "random" or "fixed" ("" is random).
func ParseSites(s string) (stseries.Sites, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "random":
		return stseries.SitesRandom, nil
	case "fixed":
		return stseries.SitesFixed, nil
	}
	return 0, fmt.Errorf("sites must be random or fixed, not %q", s)
}

// Decode reads a series file.
func Decode(r io.Reader) (*Series, error) {
	data, err := io.ReadAll(io.LimitReader(r, 16<<20))
	if err != nil {
		return nil, err
	}
	var f fileJSON
	dec := json.NewDecoder(bytes.NewReader(data))
	if err := dec.Decode(&f); err != nil {
		return nil, fmt.Errorf("this is not a readable series file: %v", err)
	}
	if f.Format != FileFormat {
		return nil, errors.New("this is not a Furlong series file (its format is not " + FileFormat + ")")
	}
	if f.Version < 1 || f.Version > FileVersion {
		return nil, fmt.Errorf("the series file has schema version %d, which this Furlong does not know (it reads up to %d); it may come from a newer Furlong", f.Version, FileVersion)
	}
	s := &Series{Name: f.Name, Options: FileOptions{Trait: f.Options.Trait, Check: f.Options.Check, Sites: f.Options.Sites, Weighting: f.Options.Weighting}}
	if _, err := ParseSites(s.Options.Sites); err != nil {
		return nil, fmt.Errorf("the series file's options: %v", err)
	}
	switch s.Options.Weighting {
	case "", WeightNone, WeightStage1:
	default:
		return nil, fmt.Errorf("the series file's weighting must be %q or %q, not %q", WeightNone, WeightStage1, s.Options.Weighting)
	}
	for i, t := range f.Trials {
		if strings.TrimSpace(t.Path) == "" {
			return nil, fmt.Errorf("trial %d of the series file has no path", i+1)
		}
		ref := TrialRef{Path: t.Path, Size: t.Size, SHA256: strings.ToLower(t.SHA256)}
		if t.Modified != "" {
			mt, err := time.Parse(time.RFC3339Nano, t.Modified)
			if err != nil {
				return nil, fmt.Errorf("trial %d of the series file has a modification time that is not a date: %q", i+1, t.Modified)
			}
			ref.ModTime = mt
		}
		if ref.SHA256 != "" {
			if b, err := hex.DecodeString(ref.SHA256); err != nil || len(b) != sha256.Size {
				return nil, fmt.Errorf("trial %d of the series file has a hash that is not 64 hex digits", i+1)
			}
		}
		s.Trials = append(s.Trials, ref)
	}
	return s, nil
}

// Encode writes s as a series file.
func Encode(w io.Writer, s *Series) error {
	f := fileJSON{Format: FileFormat, Version: FileVersion, Name: s.Name, Trials: []trialJSON{},
		Options: optionsJSON{Trait: s.Options.Trait, Check: s.Options.Check, Sites: s.Options.Sites, Weighting: s.Options.Weighting}}
	for _, t := range s.Trials {
		tj := trialJSON{Path: t.Path, Size: t.Size, SHA256: t.SHA256}
		if !t.ModTime.IsZero() {
			tj.Modified = t.ModTime.UTC().Format(time.RFC3339Nano)
		}
		f.Trials = append(f.Trials, tj)
	}
	b, err := json.MarshalIndent(f, "", "  ")
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// Problem is a trial file of a series that is missing or has changed since
// it was added.
type Problem struct {
	Path    string // as in the series file
	Missing bool   // the file is gone (or cannot be read)
	Changed bool   // the file's content differs from when it was added
	Msg     string // in plain words
}

// Resolve returns the path of trial ref for a series file at seriesPath
// (relative paths are taken from the series file's folder).
func Resolve(seriesPath string, ref TrialRef) string {
	p := filepath.FromSlash(ref.Path)
	if filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(filepath.Dir(seriesPath), p)
}

// Ref makes the reference to the trial file at path for a series file at
// seriesPath: its path relative to the series file's folder where
// possible, and its size, modification time and hash now.
func Ref(seriesPath, path string) (TrialRef, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return TrialRef{}, fmt.Errorf("%s cannot be read: %w", path, err)
	}
	fi, err := os.Stat(path)
	if err != nil {
		return TrialRef{}, err
	}
	sum := sha256.Sum256(data)
	return TrialRef{Path: relPath(seriesPath, path), Size: int64(len(data)), ModTime: fi.ModTime(), SHA256: hex.EncodeToString(sum[:])}, nil
}

func relPath(seriesPath, path string) string {
	absS, err1 := filepath.Abs(filepath.Dir(seriesPath))
	absP, err2 := filepath.Abs(path)
	if err1 != nil || err2 != nil {
		return filepath.ToSlash(path)
	}
	if rel, err := filepath.Rel(absS, absP); err == nil {
		return filepath.ToSlash(rel)
	}
	return filepath.ToSlash(absP)
}

// Check says which trial files of the series file at seriesPath are
// missing or have changed since they were added (by size and hash; a
// changed modification time alone is not a change).
func Check(seriesPath string, s *Series) []Problem {
	var out []Problem
	for _, ref := range s.Trials {
		p := Resolve(seriesPath, ref)
		data, err := os.ReadFile(p)
		if err != nil {
			msg := fmt.Sprintf("the trial file %s of the series cannot be read: %v", ref.Path, err)
			if errors.Is(err, fs.ErrNotExist) {
				msg = fmt.Sprintf("the trial file %s of the series is missing (looked for %s); it may have been moved or renamed", ref.Path, p)
			}
			out = append(out, Problem{Path: ref.Path, Missing: true, Msg: msg})
			continue
		}
		if ref.SHA256 == "" && ref.Size == 0 {
			continue
		}
		sum := sha256.Sum256(data)
		if int64(len(data)) != ref.Size || (ref.SHA256 != "" && hex.EncodeToString(sum[:]) != ref.SHA256) {
			when := ""
			if !ref.ModTime.IsZero() {
				when = " on " + ref.ModTime.Local().Format("2006-01-02 15:04")
			}
			out = append(out, Problem{Path: ref.Path, Changed: true, Msg: fmt.Sprintf("the trial file %s has changed since it was added to the series%s; the series uses it as it is now", ref.Path, when)})
		}
	}
	return out
}

// Load reads the series file at path and checks its trial files (see
// Check).
func Load(path string) (*Series, []Problem, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	defer f.Close()
	s, err := Decode(f)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", filepath.Base(path), err)
	}
	return s, Check(path, s), nil
}

// Save writes s to path (through a temporary file renamed into place).
func Save(path string, s *Series) error {
	var buf bytes.Buffer
	if err := Encode(&buf, s); err != nil {
		return err
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), ".series-*.tmp")
	if err != nil {
		return err
	}
	name := tmp.Name()
	if _, err := tmp.Write(buf.Bytes()); err != nil {
		tmp.Close()
		os.Remove(name)
		return err
	}
	if err := tmp.Close(); err != nil {
		os.Remove(name)
		return err
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return err
	}
	return nil
}
