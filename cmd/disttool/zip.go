package main

import (
	"archive/zip"
	"fmt"
	"image"
	"image/color"
	_ "image/png" // screenshots are PNG
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"time"
)

// zipDir writes every file under dir into a zip at out, under a top folder
// named like dir, in sorted order with the time stamp at, executables
// marked executable (for unzip on Linux; Windows ignores it). The same
// files give the same zip.
func zipDir(out, dir string, at time.Time) error {
	var files []string
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.Type().IsRegular() {
			files = append(files, p)
		} else if !d.IsDir() {
			return fmt.Errorf("%s is neither a file nor a folder", p)
		}
		return nil
	})
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return fmt.Errorf("%s holds no files", dir)
	}
	sort.Strings(files)
	f, err := os.Create(out)
	if err != nil {
		return err
	}
	zw := zip.NewWriter(f)
	top := filepath.Base(filepath.Clean(dir))
	for _, p := range files {
		rel, err := filepath.Rel(dir, p)
		if err != nil {
			return err
		}
		st, err := os.Stat(p)
		if err != nil {
			return err
		}
		h := &zip.FileHeader{Name: top + "/" + filepath.ToSlash(rel), Method: zip.Deflate, Modified: at}
		h.SetMode(st.Mode().Perm())
		w, err := zw.CreateHeader(h)
		if err != nil {
			return err
		}
		src, err := os.Open(p)
		if err != nil {
			return err
		}
		_, err = io.Copy(w, src)
		src.Close()
		if err != nil {
			return err
		}
	}
	if err := zw.Close(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// checkShot looks at a screenshot of a whole screen: a window that came up
// and drew itself covers much of the screen with more than a few colours;
// an empty X screen is one colour, a window that never drew is one or two.
func checkShot(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	img, _, err := image.Decode(f)
	if err != nil {
		return "", err
	}
	counts := map[color.RGBA]int{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, a := img.At(x, y).RGBA()
			counts[color.RGBA{uint8(r >> 8), uint8(g >> 8), uint8(bl >> 8), uint8(a >> 8)}]++
		}
	}
	most := 0
	for _, n := range counts {
		most = max(most, n)
	}
	total := b.Dx() * b.Dy()
	share := float64(most) / float64(total)
	info := fmt.Sprintf("%d×%d, %d colours, the commonest on %.0f%% of the screen", b.Dx(), b.Dy(), len(counts), 100*share)
	if len(counts) < 16 || share > 0.9 {
		return info, fmt.Errorf("shows no drawn window (%s)", info)
	}
	return info, nil
}
