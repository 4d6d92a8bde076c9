package plot

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot/palette"
)

// okLab is a colour in Björn Ottosson's OKLab space (2020, "A perceptual color space for image processing"):
// L is perceived lightness in [0, 1], a and b the opponent axes.
type okLab struct{ L, A, B float64 }

// linearRGB converts to linear-light sRGB components (possibly out of [0, 1] when outside the gamut).
func (c okLab) linearRGB() (r, g, b float64) {
	// Matrices from Ottosson's OKLab definition, quoted from memory; the tests check that the forward and
	// inverse matrices agree and that white maps to L = 1, a = b = 0.
	l := c.L + 0.3963377774*c.A + 0.2158037573*c.B
	m := c.L - 0.1055613458*c.A - 0.0638541728*c.B
	s := c.L - 0.0894841775*c.A - 1.2914855480*c.B
	l, m, s = l*l*l, m*m*m, s*s*s
	r = 4.0767416621*l - 3.3077115913*m + 0.2309699292*s
	g = -1.2684380046*l + 2.6097574011*m - 0.3413193965*s
	b = -0.0041960863*l - 0.7034186147*m + 1.7076147010*s
	return r, g, b
}

// labFromLinear converts linear-light sRGB to OKLab.
func labFromLinear(r, g, b float64) okLab {
	l := math.Cbrt(0.4122214708*r + 0.5363325363*g + 0.0514459929*b)
	m := math.Cbrt(0.2119034982*r + 0.6806995451*g + 0.1073969566*b)
	s := math.Cbrt(0.0883024619*r + 0.2817188376*g + 0.6299787005*b)
	return okLab{
		L: 0.2104542553*l + 0.7936177850*m - 0.0040720468*s,
		A: 1.9779984951*l - 2.4285922050*m + 0.4505937099*s,
		B: 0.0259040371*l + 0.7827717662*m - 0.8086757660*s,
	}
}

// srgbEncode applies the sRGB transfer curve (IEC 61966-2-1) to a linear component in [0, 1].
func srgbEncode(v float64) float64 {
	if v <= 0.0031308 {
		return 12.92 * v
	}
	return 1.055*math.Pow(v, 1/2.4) - 0.055
}

// srgbDecode is the inverse of srgbEncode.
func srgbDecode(v float64) float64 {
	if v <= 0.04045 {
		return v / 12.92
	}
	return math.Pow((v+0.055)/1.055, 2.4)
}

func inGamut(r, g, b float64) bool {
	const eps = 1e-9
	return r >= -eps && r <= 1+eps && g >= -eps && g <= 1+eps && b >= -eps && b <= 1+eps
}

// lch returns the sRGB colour (gamma-encoded components in [0, 1]) of OKLab lightness L, hue hDeg (degrees)
// and chroma at most c: when c is outside the sRGB gamut the chroma is reduced, keeping L and the hue exact.
func lch(L, c, hDeg float64) (r, g, b float64) {
	h := hDeg * math.Pi / 180
	ca, sa := math.Cos(h), math.Sin(h)
	at := func(c float64) (float64, float64, float64) { return okLab{L, c * ca, c * sa}.linearRGB() }
	if r, g, b := at(c); !inGamut(r, g, b) {
		lo, hi := 0.0, c
		for range 40 {
			mid := 0.5 * (lo + hi)
			if r, g, b := at(mid); inGamut(r, g, b) {
				lo = mid
			} else {
				hi = mid
			}
		}
		c = lo
	}
	r, g, b = at(c)
	clamp := func(v float64) float64 { return srgbEncode(math.Min(1, math.Max(0, v))) }
	return clamp(r), clamp(g), clamp(b)
}

func to8(v float64) uint8 { return uint8(math.Round(255 * math.Min(1, math.Max(0, v)))) }

func nrgba(r, g, b float64) color.NRGBA { return color.NRGBA{R: to8(r), G: to8(g), B: to8(b), A: 255} }

// emberAt is eddyrz's sequential colour map at fraction t in [0, 1], as gamma-encoded sRGB. Our own design:
// OKLab lightness rises linearly from 0.17 (deep indigo) to 0.95 (pale straw) so that equal steps in value read
// as equal steps in brightness, also in grey-scale print; the hue turns from 275° through magenta and copper
// (360°+25°) to gold (445° = 85°); chroma swells in the middle of the range and is trimmed to the sRGB gamut.
func emberAt(t float64) (r, g, b float64) {
	t = math.Min(1, math.Max(0, t))
	L := 0.17 + 0.78*t
	h := 275 + 170*t
	c := 0.045 + 0.145*math.Sin(math.Pi*(0.1+0.8*t))
	return lch(L, c, h)
}

// lutSize is the number of colours in a ColorMap's table; field maps bin triangles by this index.
const lutSize = 256

// ColorMap maps values in [Min, Max] onto eddyrz's own sequential colour map (see emberAt). It implements
// palette.ColorMap. The zero value is not usable; call NewColorMap.
type ColorMap struct {
	min, max, alpha float64
	lut             [lutSize]color.NRGBA
}

var _ palette.ColorMap = (*ColorMap)(nil)

// NewColorMap returns the colour map over [min, max], fully opaque.
func NewColorMap(min, max float64) *ColorMap {
	cm := &ColorMap{min: min, max: max, alpha: 1}
	for i := range cm.lut {
		cm.lut[i] = nrgba(emberAt(float64(i) / (lutSize - 1)))
	}
	return cm
}

// index returns the table index of fraction t in [0, 1]; values outside (and NaN) are clamped.
func index(t float64) int {
	if !(t > 0) {
		return 0
	}
	return min(int(t*lutSize), lutSize-1)
}

// At returns the colour of v; it is an error for v to lie outside [Min, Max] or to be NaN.
func (cm *ColorMap) At(v float64) (color.Color, error) {
	if !(v >= cm.min && v <= cm.max) {
		return nil, fmt.Errorf("plot: value %g outside colour map range [%g, %g]", v, cm.min, cm.max)
	}
	t := 0.0
	if cm.max > cm.min {
		t = (v - cm.min) / (cm.max - cm.min)
	}
	return cm.color(index(t)), nil
}

func (cm *ColorMap) color(i int) color.NRGBA {
	c := cm.lut[i]
	c.A = uint8(math.Round(255 * cm.alpha))
	return c
}

// Max returns the value mapped to the last colour.
func (cm *ColorMap) Max() float64 { return cm.max }

// SetMax sets the value mapped to the last colour.
func (cm *ColorMap) SetMax(v float64) { cm.max = v }

// Min returns the value mapped to the first colour.
func (cm *ColorMap) Min() float64 { return cm.min }

// SetMin sets the value mapped to the first colour.
func (cm *ColorMap) SetMin(v float64) { cm.min = v }

// Alpha returns the opacity in [0, 1].
func (cm *ColorMap) Alpha() float64 { return cm.alpha }

// SetAlpha sets the opacity; it panics unless 0 <= a <= 1.
func (cm *ColorMap) SetAlpha(a float64) {
	if !(a >= 0 && a <= 1) {
		panic(fmt.Sprintf("plot: alpha %g outside [0, 1]", a))
	}
	cm.alpha = a
}

// Palette returns n colours evenly spaced along the map (n >= 2), first to last.
func (cm *ColorMap) Palette(n int) palette.Palette {
	if n < 2 {
		panic("plot: palette needs at least 2 colours")
	}
	cs := make(colors, n)
	for i := range cs {
		c := nrgba(emberAt(float64(i) / float64(n-1)))
		c.A = uint8(math.Round(255 * cm.alpha))
		cs[i] = c
	}
	return cs
}

type colors []color.Color

func (c colors) Colors() []color.Color { return c }

// RegionColor returns the fill colour for the i-th region of a mesh picture (i >= 0): light, clearly
// distinguishable tints of our own choosing; hues step by the golden angle so neighbours in the list differ
// strongly, and lightness alternates between two levels.
func RegionColor(i int) color.NRGBA {
	h := 20 + 137.507764*float64(i)
	L := 0.86
	if i%2 == 1 {
		L = 0.76
	}
	return nrgba(lch(L, 0.085, math.Mod(h, 360)))
}

// seriesHues are the hues (OKLab, degrees) of line-chart series, picked so that consecutive series contrast.
var seriesHues = [...]float64{255, 40, 150, 330, 85, 205, 0, 115}

// SeriesColor returns the stroke colour of the i-th line-chart series (i >= 0): medium-dark and saturated so
// thin lines stay visible on white; after eight series the hues repeat one step darker.
func SeriesColor(i int) color.NRGBA {
	L := 0.55 - 0.12*float64((i/len(seriesHues))%2)
	return nrgba(lch(L, 0.16, seriesHues[i%len(seriesHues)]))
}
