package main

import (
	"fmt"
	"image"
	"image/color"
	"image/draw"
	"image/png"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"earshot/receiver/plan"

	"golang.org/x/image/font"
	"golang.org/x/image/font/basicfont"
	"golang.org/x/image/math/fixed"
)

const sweepSynopsis = `wire [--lengths 10,20,...] [--heights 10] | hours [--date YYYY-MM-DD]
       [--spot NAME | --at-lat LAT --at-lon LON] [--scenario FILE] [rig flags]
       [--time RFC3339] [--out FILE.png]

wire: audible stations by day and at night for each wire length (and
height): what each extra 10 m of wire buys. hours: audible stations hour by
hour through a day (UTC), and each station's field.`

func runSweep(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || (args[0] != "wire" && args[0] != "hours" && !strings.HasPrefix(args[0], "-")) {
		return report("sweep", usagef("want \"sweep wire\" or \"sweep hours\""), stderr)
	}
	mode := "help"
	if !strings.HasPrefix(args[0], "-") {
		mode, args = args[0], args[1:]
	}
	fs := newFlagSet("sweep", sweepSynopsis, stdout)
	w := addWorldFlags(fs, true)
	lengths := fs.String("lengths", "10,20,30,40,50,60,80", "wire lengths, m (wire)")
	heights := fs.String("heights", "", "wire heights, m (wire; default the rig's)")
	date := fs.String("date", "", "day for the hour sweep, YYYY-MM-DD (default today, UTC)")
	out := fs.String("out", "", "also draw a plot to this PNG file")
	if done, status := parseFlags(fs, args, stderr); done {
		return status
	}
	if mode == "help" {
		return report("sweep", usagef("want \"sweep wire\" or \"sweep hours\""), stderr)
	}
	set := setFlags(fs)
	l, err := w.load(set)
	if err != nil {
		return report("sweep", err, stderr)
	}
	spot := l.spots[0]
	var series []plotSeries
	var xs []float64
	var xlabel string
	switch mode {
	case "wire":
		ls, err := floatList("--lengths", *lengths, 1, 1000)
		if err != nil {
			return report("sweep", err, stderr)
		}
		hs := []float64{l.planner.Rig().Antenna.HeightM}
		if *heights != "" {
			if hs, err = floatList("--heights", *heights, 0.5, 300); err != nil {
				return report("sweep", err, stderr)
			}
		}
		day, night := plan.DayAndNight(l.at, spot)
		progress, finish := progressTo(stderr, "wire sweep")
		rows, err := l.planner.WireSweep(spot, ls, hs, day, night, progress)
		finish()
		if err != nil {
			return report("sweep", err, stderr)
		}
		tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintf(stdout, "Audible stations at %q by wire length (day %s, night %s UTC)\n", spot.Name, day.Format("15:04"), night.Format("15:04"))
		fmt.Fprintln(tw, "wire m\theight m\tday\tnight\tgain by day\tgain at night\t")
		prev := map[float64]WireCount{}
		for _, r := range rows {
			p, ok := prev[r.HeightM]
			dd, dn := "", ""
			if ok {
				dd, dn = fmt.Sprintf("%+d", r.AudibleDay-p.day), fmt.Sprintf("%+d", r.AudibleNight-p.night)
			}
			fmt.Fprintf(tw, "%g\t%g\t%d\t%d\t%s\t%s\t\n", r.WireM, r.HeightM, r.AudibleDay, r.AudibleNight, dd, dn)
			prev[r.HeightM] = WireCount{r.AudibleDay, r.AudibleNight}
		}
		tw.Flush()
		xlabel = "wire length, m"
		d, n := plotSeries{name: "day", c: color.RGBA{220, 150, 30, 255}}, plotSeries{name: "night", c: color.RGBA{60, 60, 160, 255}}
		for _, r := range rows {
			if r.HeightM == hs[0] {
				xs = append(xs, r.WireM)
				d.ys = append(d.ys, float64(r.AudibleDay))
				n.ys = append(n.ys, float64(r.AudibleNight))
			}
		}
		series = []plotSeries{d, n}
	case "hours":
		start := time.Date(l.at.Year(), l.at.Month(), l.at.Day(), 0, 0, 0, 0, time.UTC)
		if *date != "" {
			t, err := time.Parse(time.DateOnly, *date)
			if err != nil {
				return report("sweep", usagef("--date %q: want YYYY-MM-DD", *date), stderr)
			}
			start = t
		}
		progress, finish := progressTo(stderr, "hour sweep")
		rows, err := l.planner.HourSweep(spot, start, progress)
		finish()
		if err != nil {
			return report("sweep", err, stderr)
		}
		fmt.Fprintf(stdout, "Audible stations at %q hour by hour, %s (UTC)\n", spot.Name, start.Format(time.DateOnly))
		tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "hour\tsun\taudible\tstations")
		c := plotSeries{name: "audible", c: color.RGBA{60, 60, 160, 255}}
		for _, r := range rows {
			sun := "day"
			if r.Night {
				sun = "night"
			}
			var ids []string
			for _, s := range l.planner.Stations() {
				if r.Heard[s.ID] {
					ids = append(ids, s.ID)
				}
			}
			fmt.Fprintf(tw, "%02d\t%s\t%d\t%s\n", r.At.Hour(), sun, r.Audible, strings.Join(ids, " "))
			xs = append(xs, float64(r.At.Hour()))
			c.ys = append(c.ys, float64(r.Audible))
		}
		tw.Flush()
		xlabel = "hour, UTC"
		series = []plotSeries{c}
	default:
		return report("sweep", usagef("want \"sweep wire\" or \"sweep hours\", got %q", mode), stderr)
	}
	if *out != "" {
		if err := writePlot(*out, fmt.Sprintf("%s - %s", l.sc.Name, spot.Name), xlabel, "stations audible", xs, series); err != nil {
			return report("sweep", err, stderr)
		}
		fmt.Fprintf(stdout, "wrote %s\n", *out)
	}
	return exitOK
}

// WireCount is the day and night counts of one wire length.
type WireCount struct{ day, night int }

func floatList(flagName, s string, lo, hi float64) ([]float64, error) {
	var out []float64
	for _, p := range strings.Split(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil || v < lo || v > hi {
			return nil, usagef("%s: each value must be a number between %g and %g, got %q", flagName, lo, hi, p)
		}
		out = append(out, v)
	}
	return out, nil
}

type plotSeries struct {
	name string
	c    color.RGBA
	ys   []float64
}

// writePlot draws a simple line chart to a PNG file.
func writePlot(file, title, xlabel, ylabel string, xs []float64, series []plotSeries) error {
	const W, H, L, R, T, B = 640, 400, 60, 20, 40, 50
	img := image.NewRGBA(image.Rect(0, 0, W, H))
	draw.Draw(img, img.Bounds(), &image.Uniform{color.RGBA{250, 248, 242, 255}}, image.Point{}, draw.Src)
	ink := color.RGBA{20, 20, 24, 255}
	text := func(x, y int, s string) {
		d := font.Drawer{Dst: img, Src: image.NewUniform(ink), Face: basicfont.Face7x13, Dot: fixed.P(x, y)}
		d.DrawString(s)
	}
	xmin, xmax := xs[0], xs[len(xs)-1]
	if xmax == xmin {
		xmax = xmin + 1
	}
	ymax := 1.0
	for _, s := range series {
		for _, y := range s.ys {
			ymax = math.Max(ymax, y)
		}
	}
	ymax = math.Ceil(ymax * 1.1)
	px := func(x float64) int { return L + int((x-xmin)/(xmax-xmin)*float64(W-L-R)) }
	py := func(y float64) int { return H - B - int(y/ymax*float64(H-T-B)) }
	for x := L; x <= W-R; x++ {
		img.SetRGBA(x, H-B, ink)
	}
	for y := T; y <= H-B; y++ {
		img.SetRGBA(L, y, ink)
	}
	for i := 0; i <= 4; i++ {
		v := ymax * float64(i) / 4
		text(L-30, py(v)+4, fmt.Sprintf("%.0f", v))
	}
	for _, x := range xs {
		text(px(x)-8, H-B+16, fmt.Sprintf("%g", x))
	}
	for k, s := range series {
		for i := 1; i < len(s.ys); i++ {
			line(img, px(xs[i-1]), py(s.ys[i-1]), px(xs[i]), py(s.ys[i]), s.c)
		}
		for i := range s.ys {
			disc(img, px(xs[i]), py(s.ys[i]), 3, s.c)
		}
		disc(img, W-R-90, T+8+16*k, 4, s.c)
		text(W-R-80, T+12+16*k, s.name)
	}
	text(L, 20, title)
	text(W/2-len(xlabel)*3, H-12, xlabel)
	text(4, T-8, ylabel)
	f, err := os.Create(file)
	if err != nil {
		return err
	}
	if err := png.Encode(f, img); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// line draws a straight line (simple DDA).
func line(img *image.RGBA, x0, y0, x1, y1 int, c color.RGBA) {
	n := max(abs(x1-x0), abs(y1-y0), 1)
	for i := 0; i <= n; i++ {
		x := x0 + (x1-x0)*i/n
		y := y0 + (y1-y0)*i/n
		img.SetRGBA(x, y, c)
		img.SetRGBA(x, y+1, c)
	}
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}
