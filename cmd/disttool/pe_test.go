package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// linkTiny links an empty Windows program with the Go linker (no C
// compiler needed), with the extra linker flags and the files (a .syso)
// given, and returns its bytes.
func linkTiny(t *testing.T, ldflags string, extra map[string][]byte) []byte {
	t.Helper()
	dir := t.TempDir()
	files := map[string][]byte{"main.go": []byte("package main\n\nfunc main() {}\n")}
	for k, v := range extra {
		files[k] = v
	}
	for name, b := range files {
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	exe := filepath.Join(dir, "tiny.exe")
	cmd := exec.Command("go", "build", "-ldflags="+ldflags, "-o", exe, ".")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOOS=windows", "GOARCH=amd64", "CGO_ENABLED=0", "GO111MODULE=off", "GOFLAGS=")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	b, err := os.ReadFile(exe)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestCheckExeWithoutResources: the Go linker alone makes a console
// program without an icon or version; -H=windowsgui a GUI program. Both
// are refused with a message that names the problem.
func TestCheckExeWithoutResources(t *testing.T) {
	if testing.Short() {
		t.Skip("links Windows programs")
	}
	if _, err := checkExe(linkTiny(t, "-s", nil), "0.1.0", 1); err == nil || !strings.Contains(err.Error(), "no resources") {
		t.Errorf("console program without resources: %v, want 'no resources'", err)
	}
	if _, err := checkExe(linkTiny(t, "-H=windowsgui", nil), "0.1.0", 1); err == nil || !strings.Contains(err.Error(), "GUI-subsystem") {
		t.Errorf("GUI program: %v, want the GUI-subsystem message", err)
	}
}

// TestCheckExeWithResources compiles an icon, a manifest and a version
// resource with mingw's windres (the tool .ci/dist.sh uses; the test is
// skipped where it is not installed) and links them into a tiny program:
// checkExe reads the version back and refuses another one.
func TestCheckExeWithResources(t *testing.T) {
	if testing.Short() {
		t.Skip("links Windows programs")
	}
	windres, err := exec.LookPath("x86_64-w64-mingw32-windres")
	if err != nil {
		t.Skip("x86_64-w64-mingw32-windres not installed (apt-get install binutils-mingw-w64-x86-64)")
	}
	dir := t.TempDir()
	ico := filepath.Join(dir, "tiny.ico")
	f, err := os.Create(ico)
	if err != nil {
		t.Fatal(err)
	}
	if err := writeIcon(f, halfRed(64), []int{16, 32}); err != nil {
		t.Fatal(err)
	}
	f.Close()
	man := `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<assembly xmlns="urn:schemas-microsoft-com:asm.v1" manifestVersion="1.0"><assemblyIdentity version="2.3.4.5" name="tiny" type="win32"/></assembly>`
	if err := os.WriteFile(filepath.Join(dir, "tiny.manifest"), []byte(man), 0o644); err != nil {
		t.Fatal(err)
	}
	rc := `1 ICON "tiny.ico"
1 24 "tiny.manifest"
1 VERSIONINFO
FILEVERSION 2,3,4,5
PRODUCTVERSION 2,3,4,5
BEGIN
  BLOCK "StringFileInfo"
  BEGIN
    BLOCK "040904B0"
    BEGIN
      VALUE "ProductName", "Tiny"
    END
  END
  BLOCK "VarFileInfo"
  BEGIN
    VALUE "Translation", 0x409, 1200
  END
END
`
	if err := os.WriteFile(filepath.Join(dir, "tiny.rc"), []byte(rc), 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(windres, "-i", "tiny.rc", "-O", "coff", "-o", "rsrc_windows_amd64.syso")
	cmd.Dir = dir
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("windres: %v\n%s", err, out)
	}
	syso, err := os.ReadFile(filepath.Join(dir, "rsrc_windows_amd64.syso"))
	if err != nil {
		t.Fatal(err)
	}
	b := linkTiny(t, "-s", map[string][]byte{"rsrc_windows_amd64.syso": syso})
	info, err := checkExe(b, "2.3.4", 5)
	if err != nil {
		t.Fatalf("checkExe: %v", err)
	}
	if !strings.Contains(info, "2 icon images") || !strings.Contains(info, "version 2.3.4.5") {
		t.Errorf("summary %q: want 2 icon images and version 2.3.4.5", info)
	}
	if _, err := checkExe(b, "2.3.4", 6); err == nil || !strings.Contains(err.Error(), "want 2.3.4.6") {
		t.Errorf("another build number: %v, want a version mismatch", err)
	}
}

func TestCheckExeRefusesOtherFiles(t *testing.T) {
	t.Parallel()
	for _, b := range [][]byte{nil, []byte("PK\x03\x04 not an exe"), append([]byte("MZ"), make([]byte, 100)...)} {
		if _, err := checkExe(b, "0.1.0", 1); err == nil {
			t.Errorf("%q: no error", b)
		}
	}
}

func TestVersionQuad(t *testing.T) {
	t.Parallel()
	q, err := versionQuad("1.20.300", 4)
	if err != nil || q != [4]uint16{1, 20, 300, 4} {
		t.Errorf("1.20.300 build 4: %v %v", q, err)
	}
	for _, v := range []string{"1.2", "1.2.3.4", "1.x.3", "1.2.70000"} {
		if _, err := versionQuad(v, 1); err == nil {
			t.Errorf("%q: no error", v)
		}
	}
}
