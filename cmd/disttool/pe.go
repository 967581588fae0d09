package main

import (
	"bytes"
	"debug/pe"
	"encoding/binary"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// Resource types (Microsoft, "Resource Types", winuser.h RT_*).
const (
	rtIcon      = 3
	rtGroupIcon = 14
	rtVersion   = 16
	rtManifest  = 24
)

// systemDLLs are the libraries every Windows 10/11 has in system32. An
// executable that imports anything else (a mingw runtime such as
// libwinpthread-1.dll, say) starts on the build machine and fails on a
// field-office laptop.
var systemDLLs = []string{
	"advapi32.dll", "bcrypt.dll", "comctl32.dll", "comdlg32.dll", "crypt32.dll", "dwmapi.dll",
	"gdi32.dll", "imm32.dll", "kernel32.dll", "msvcrt.dll", "ntdll.dll", "ole32.dll",
	"oleaut32.dll", "opengl32.dll", "powrprof.dll", "setupapi.dll", "shcore.dll", "shell32.dll",
	"shlwapi.dll", "user32.dll", "userenv.dll", "uxtheme.dll", "version.dll", "winmm.dll",
	"ws2_32.dll",
}

// checkExe checks what the Windows package promises about furlong.exe: an
// x86-64 console program (so that its commands print in cmd and
// PowerShell; cmd/furlong/console_windows.go lets go of the console when
// it opens the window), with an icon, a manifest and a version resource
// whose file version is VERSION.BUILD, importing only system libraries.
// It returns a one-line summary.
func checkExe(b []byte, version string, build int) (string, error) {
	f, err := pe.NewFile(bytes.NewReader(b))
	if err != nil {
		return "", fmt.Errorf("not a Windows executable: %w", err)
	}
	defer f.Close()
	if f.Machine != pe.IMAGE_FILE_MACHINE_AMD64 {
		return "", fmt.Errorf("machine %#x, want x86-64 (%#x)", f.Machine, pe.IMAGE_FILE_MACHINE_AMD64)
	}
	oh, ok := f.OptionalHeader.(*pe.OptionalHeader64)
	if !ok {
		return "", errors.New("not a 64-bit (PE32+) executable")
	}
	switch oh.Subsystem {
	case pe.IMAGE_SUBSYSTEM_WINDOWS_CUI:
	case pe.IMAGE_SUBSYSTEM_WINDOWS_GUI:
		return "", errors.New("a GUI-subsystem program: its commands would print nothing in cmd or PowerShell (built with -H=windowsgui?)")
	default:
		return "", fmt.Errorf("subsystem %d, want console (%d)", oh.Subsystem, pe.IMAGE_SUBSYSTEM_WINDOWS_CUI)
	}
	// debug/pe's ImportedLibraries is not implemented (it returns nothing);
	// ImportedSymbols gives "symbol:library" for every import.
	syms, err := f.ImportedSymbols()
	if err != nil {
		return "", fmt.Errorf("import table: %w", err)
	}
	var libs []string
	for _, s := range syms {
		if _, l, ok := strings.Cut(s, ":"); ok && !slices.Contains(libs, strings.ToLower(l)) {
			libs = append(libs, strings.ToLower(l))
		}
	}
	slices.Sort(libs)
	if len(libs) == 0 {
		return "", errors.New("imports no library at all: not a program that could start")
	}
	for _, l := range libs {
		if !slices.Contains(systemDLLs, l) && !strings.HasPrefix(l, "api-ms-win-") {
			return "", fmt.Errorf("imports %s, which is not a Windows system library (imports: %s)", l, strings.Join(libs, ", "))
		}
	}
	rs, err := resources(f, oh)
	if err != nil {
		return "", err
	}
	for _, need := range []struct {
		typ  uint32
		what string
	}{{rtGroupIcon, "icon"}, {rtIcon, "icon image"}, {rtManifest, "manifest"}, {rtVersion, "version resource"}} {
		if len(rs.types[need.typ]) == 0 {
			return "", fmt.Errorf("no %s (resource type %d)", need.what, need.typ)
		}
	}
	fv, pv, err := fixedVersion(rs.types[rtVersion][0])
	if err != nil {
		return "", err
	}
	want, err := versionQuad(version, build)
	if err != nil {
		return "", err
	}
	if fv != want || pv != want {
		return "", fmt.Errorf("version resource says file %s, product %s; want %s", quad(fv), quad(pv), quad(want))
	}
	return fmt.Sprintf("x86-64 console program, %d icon images, manifest, version %s; imports %s",
		len(rs.types[rtIcon]), quad(fv), strings.Join(libs, " ")), nil
}

type resourceSet struct {
	types map[uint32][][]byte // the data of every resource of each numbered type
}

// resources reads the resource tree (Microsoft, "PE Format", section
// "The .rsrc Section"): a directory of types, each a directory of names,
// each a directory of languages, whose leaves point at the data by RVA.
func resources(f *pe.File, oh *pe.OptionalHeader64) (*resourceSet, error) {
	if len(oh.DataDirectory) <= pe.IMAGE_DIRECTORY_ENTRY_RESOURCE || oh.DataDirectory[pe.IMAGE_DIRECTORY_ENTRY_RESOURCE].Size == 0 {
		return nil, errors.New("no resources (no icon, manifest or version): was the .syso left out of the build?")
	}
	rva := oh.DataDirectory[pe.IMAGE_DIRECTORY_ENTRY_RESOURCE].VirtualAddress
	var sec *pe.Section
	for _, s := range f.Sections {
		if rva >= s.VirtualAddress && rva < s.VirtualAddress+max(s.VirtualSize, s.Size) {
			sec = s
		}
	}
	if sec == nil {
		return nil, errors.New("the resource directory lies in no section")
	}
	data, err := sec.Data()
	if err != nil {
		return nil, err
	}
	base := int(rva - sec.VirtualAddress)
	if base >= len(data) {
		return nil, errors.New("the resource directory lies past its section's data")
	}
	dir := data[base:]
	u16 := func(off int) (uint16, error) {
		if off < 0 || off+2 > len(dir) {
			return 0, errors.New("resource directory cut short")
		}
		return binary.LittleEndian.Uint16(dir[off:]), nil
	}
	u32 := func(off int) (uint32, error) {
		if off < 0 || off+4 > len(dir) {
			return 0, errors.New("resource directory cut short")
		}
		return binary.LittleEndian.Uint32(dir[off:]), nil
	}
	// entries lists a directory's (id, offset) pairs; IMAGE_RESOURCE_DIRECTORY
	// has the named-entry count at 12, the id-entry count at 14, entries of
	// 8 bytes from 16.
	entries := func(off int) ([][2]uint32, error) {
		named, err := u16(off + 12)
		if err != nil {
			return nil, err
		}
		ids, err := u16(off + 14)
		if err != nil {
			return nil, err
		}
		var out [][2]uint32
		for i := 0; i < int(named)+int(ids); i++ {
			id, err := u32(off + 16 + 8*i)
			if err != nil {
				return nil, err
			}
			to, err := u32(off + 16 + 8*i + 4)
			if err != nil {
				return nil, err
			}
			out = append(out, [2]uint32{id, to})
		}
		return out, nil
	}
	const subdir = 0x80000000
	rs := &resourceSet{types: map[uint32][][]byte{}}
	var leaves func(off int, depth int) ([][]byte, error)
	leaves = func(off int, depth int) ([][]byte, error) {
		if depth > 3 {
			return nil, errors.New("resource tree deeper than type, name, language")
		}
		es, err := entries(off)
		if err != nil {
			return nil, err
		}
		var out [][]byte
		for _, e := range es {
			if e[1]&subdir != 0 {
				l, err := leaves(int(e[1]&^subdir), depth+1)
				if err != nil {
					return nil, err
				}
				out = append(out, l...)
				continue
			}
			drva, err := u32(int(e[1]))
			if err != nil {
				return nil, err
			}
			size, err := u32(int(e[1]) + 4)
			if err != nil {
				return nil, err
			}
			start := int(drva) - int(sec.VirtualAddress)
			if start < 0 || start+int(size) > len(data) {
				return nil, errors.New("a resource's data lies outside the resource section")
			}
			out = append(out, data[start:start+int(size)])
		}
		return out, nil
	}
	types, err := entries(0)
	if err != nil {
		return nil, err
	}
	for _, t := range types {
		if t[0]&subdir != 0 || t[1]&subdir == 0 {
			continue // a type named by a string, or a malformed entry: not one we look for
		}
		l, err := leaves(int(t[1]&^subdir), 2)
		if err != nil {
			return nil, err
		}
		rs.types[t[0]] = append(rs.types[t[0]], l...)
	}
	return rs, nil
}

// fixedVersion finds VS_FIXEDFILEINFO (Microsoft, "VS_FIXEDFILEINFO
// structure": the signature 0xFEEF04BD, the structure version, then the
// file version's high and low words, then the product version's) in a
// version resource and returns the file and product versions.
func fixedVersion(b []byte) (file, product [4]uint16, err error) {
	i := bytes.Index(b, []byte{0xBD, 0x04, 0xEF, 0xFE})
	if i < 0 || i+24 > len(b) {
		return file, product, errors.New("the version resource has no fixed file information")
	}
	read := func(off int) [4]uint16 {
		ms := binary.LittleEndian.Uint32(b[off:])
		ls := binary.LittleEndian.Uint32(b[off+4:])
		return [4]uint16{uint16(ms >> 16), uint16(ms), uint16(ls >> 16), uint16(ls)}
	}
	return read(i + 8), read(i + 16), nil
}

// versionQuad turns "x.y.z" and the build number into Windows' four parts.
func versionQuad(version string, build int) ([4]uint16, error) {
	var q [4]uint16
	parts := strings.Split(version, ".")
	if len(parts) != 3 {
		return q, fmt.Errorf("version %q is not of the form x.y.z", version)
	}
	for i, p := range append(parts, strconv.Itoa(build)) {
		n, err := strconv.ParseUint(p, 10, 16)
		if err != nil {
			return q, fmt.Errorf("version %q, build %d: each part must be a whole number up to 65535", version, build)
		}
		q[i] = uint16(n)
	}
	return q, nil
}

func quad(q [4]uint16) string { return fmt.Sprintf("%d.%d.%d.%d", q[0], q[1], q[2], q[3]) }
