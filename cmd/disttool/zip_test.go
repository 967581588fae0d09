package main

import (
	"archive/zip"
	"bytes"
	"image"
	"image/color"
	"image/png"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

func TestZipDir(t *testing.T) {
	t.Parallel()
	dir := filepath.Join(t.TempDir(), "furlong-1.2.3-windows-amd64")
	if err := os.MkdirAll(filepath.Join(dir, "sub"), 0o755); err != nil {
		t.Fatal(err)
	}
	write := func(name, text string, mode os.FileMode) {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), mode); err != nil {
			t.Fatal(err)
		}
	}
	write("furlong.exe", "MZ...", 0o755)
	write("README.txt", "read me\r\n", 0o644)
	write("sub/b.txt", "b", 0o644)
	at := time.Date(2026, 12, 3, 0, 0, 0, 0, time.UTC)
	out := filepath.Join(t.TempDir(), "a.zip")
	if err := zipDir(out, dir, at); err != nil {
		t.Fatal(err)
	}
	first, _ := os.ReadFile(out)
	if err := zipDir(out, dir, at); err != nil {
		t.Fatal(err)
	}
	second, _ := os.ReadFile(out)
	if !bytes.Equal(first, second) {
		t.Error("two zips of the same files differ")
	}
	zr, err := zip.OpenReader(out)
	if err != nil {
		t.Fatal(err)
	}
	defer zr.Close()
	var names []string
	for _, f := range zr.File {
		names = append(names, f.Name)
		if !f.Modified.Equal(at) {
			t.Errorf("%s: time %v", f.Name, f.Modified)
		}
		if strings.HasSuffix(f.Name, ".exe") && f.Mode().Perm()&0o100 == 0 {
			t.Errorf("%s: mode %v, want executable", f.Name, f.Mode())
		}
	}
	want := "furlong-1.2.3-windows-amd64/README.txt furlong-1.2.3-windows-amd64/furlong.exe furlong-1.2.3-windows-amd64/sub/b.txt"
	if got := strings.Join(names, " "); got != want {
		t.Errorf("names %s, want %s", got, want)
	}
	rc, _ := zr.File[0].Open()
	b, _ := io.ReadAll(rc)
	if string(b) != "read me\r\n" {
		t.Errorf("README.txt holds %q", b)
	}
}

func TestCheckShot(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	save := func(name string, img image.Image) string {
		p := filepath.Join(dir, name)
		var buf bytes.Buffer
		if err := png.Encode(&buf, img); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	blank := image.NewRGBA(image.Rect(0, 0, 200, 100))
	if _, err := checkShot(save("blank.png", blank)); err == nil {
		t.Error("a black screen passes")
	}
	drawn := image.NewRGBA(image.Rect(0, 0, 200, 100))
	for y := 0; y < 100; y++ {
		for x := 0; x < 200; x++ {
			drawn.Set(x, y, color.RGBA{uint8(x), uint8(y), 128, 255})
		}
	}
	if _, err := checkShot(save("drawn.png", drawn)); err != nil {
		t.Error(err)
	}
}

func TestPrintCells(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	f.SetCellValue("Sheet1", "A1", "Yield")
	f.SetCellValue("Sheet1", "B2", 5.25)
	f.NewSheet("Map")
	f.SetCellValue("Map", "C3", "line one\nline two")
	day, _ := f.NewStyle(&excelize.Style{NumFmt: 14})
	custom := `yyyy-mm-dd hh:mm`
	stamp, _ := f.NewStyle(&excelize.Style{CustomNumFmt: &custom})
	money := `[Red]0.00" dm"`
	plain, _ := f.NewStyle(&excelize.Style{CustomNumFmt: &money})
	f.SetCellValue("Map", "A4", 46359.5)
	f.SetCellStyle("Map", "A4", "A4", day)
	f.SetCellValue("Map", "B4", 46359.59)
	f.SetCellStyle("Map", "B4", "B4", stamp)
	f.SetCellValue("Map", "C4", 3.5)
	f.SetCellStyle("Map", "C4", "C4", plain)
	p := filepath.Join(t.TempDir(), "r.xlsx")
	if err := f.SaveAs(p); err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	if err := printCells(p, &out); err != nil {
		t.Fatal(err)
	}
	want := "# sheet Sheet1: 2 rows\nSheet1!A1\tYield\nSheet1!B2\t5.25\n# sheet Map: 4 rows\nMap!C3\tline one\\nline two\nMap!A4\t(a date or time)\nMap!B4\t(a date or time)\nMap!C4\t3.5\n"
	if out.String() != want {
		t.Errorf("got\n%s\nwant\n%s", out.String(), want)
	}
	bad := filepath.Join(t.TempDir(), "bad.xlsx")
	os.WriteFile(bad, []byte("not a workbook"), 0o644)
	if err := printCells(bad, io.Discard); err == nil {
		t.Error("a file that is no workbook opens")
	}
}
