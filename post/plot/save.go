package plot

import (
	"fmt"
	"image/color"
	"os"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgpdf"
	"gonum.org/v1/plot/vg/vgsvg"
)

// PNGDPI is the resolution of saved PNG files in pixels per inch.
const PNGDPI = 150

// Save draws d on a page of widthCm × heightCm centimetres and writes it to path in the format named by the
// extension: .png (PNGDPI pixels per inch, white background), .svg or .pdf. The file is written to a temporary
// file in the same directory and renamed into place, so readers never see a partial picture and a failed save
// leaves any old file untouched.
func Save(d Drawer, path string, widthCm, heightCm float64) (err error) {
	if !(widthCm > 0 && heightCm > 0) {
		return fmt.Errorf("plot: save %s: page size %g × %g cm must be positive", path, widthCm, heightCm)
	}
	w, h := vg.Length(widthCm)*vg.Centimeter, vg.Length(heightCm)*vg.Centimeter
	var c vg.CanvasWriterTo
	switch ext := strings.ToLower(filepath.Ext(path)); ext {
	case ".png":
		c = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(PNGDPI),
			vgimg.UseBackgroundColor(color.White))}
	case ".svg":
		c = vgsvg.New(w, h)
	case ".pdf":
		c = vgpdf.New(w, h)
	default:
		return fmt.Errorf("plot: save %s: unknown picture format %q (want .png, .svg or .pdf)", path, ext)
	}
	d.Draw(draw.New(c))

	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".*.tmp")
	if err != nil {
		return fmt.Errorf("plot: save %s: %w", path, err)
	}
	tmp := f.Name()
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(tmp)
		}
	}()
	if _, err = c.WriteTo(f); err != nil {
		return fmt.Errorf("plot: save %s: %w", path, err)
	}
	if err = f.Chmod(0o644); err != nil {
		return fmt.Errorf("plot: save %s: %w", path, err)
	}
	if err = f.Close(); err != nil {
		return fmt.Errorf("plot: save %s: %w", path, err)
	}
	if err = os.Rename(tmp, path); err != nil {
		return fmt.Errorf("plot: save %s: %w", path, err)
	}
	return nil
}
