//go:build js

package main

import (
	"fmt"
	"image/color"
	"strings"

	"earshot/wasm/screen"

	"github.com/hajimehoshi/ebiten/v2"
)

// drawCard shows the selected station: its waves, the chain stage by
// stage at its field, and the trap when one is needed.
func (g *game) drawCard(dst *ebiten.Image) {
	id := g.s.Selected()
	h, ok := g.s.Heard(id)
	if id == "" || !ok {
		delete(g.widgets, "card")
		delete(g.widgets, "card.close")
		return
	}
	st := h.Station
	var lines []string
	add := func(format string, a ...any) { lines = append(lines, fmt.Sprintf(format, a...)) }
	add("%s  %s", st.ID, st.Name)
	power := fmt.Sprintf("%g kW", st.KWDay)
	if st.KWNight > 0 && st.KWNight != st.KWDay {
		power += fmt.Sprintf(" by day, %g kW at night", st.KWNight)
	}
	add("%.0f kHz · %s · %.0f km at %.0f°", float64(st.KHz), power, h.DistKm, h.BearingDeg)
	add("ground wave %.1f dBµV/m", h.GroundDB)
	if h.SkyDB != nil {
		add("sky wave %.1f dBµV/m (median; ±%.0f dB night to night)", *h.SkyDB, h.SkyDecile)
	} else {
		add("sky wave: none now (the sun is up along the path)")
	}
	add("together %.1f dBµV/m · margin %+.1f dB · S/N %.0f dB", h.FieldDB, h.MarginDB, h.SNRDB)
	add("heard on %.0f%% of nights at this hour", 100*h.Chance)
	if rc, err := g.s.Receive(st.KHz, h.FieldDB); err == nil {
		add("")
		add("antenna: %.1f m effective height, %.0f µV open circuit", rc.HeffM, rc.VocUV)
		if rc.LoadingUH > 0 {
			add("loading coil %.0f µH (%.0f turns)", rc.LoadingUH, rc.LoadingTurns)
		} else if rc.SeriesPF > 0 {
			add("series capacitor %.0f pF", rc.SeriesPF)
		}
		add("tuned circuit: loaded Q %.0f · detector %.2f mV RF", rc.Tank.LoadedQ, rc.DetectorMV)
		add("detector %s DC · audio %.2f mV · %.0f dB SPL", volts(rc.DCV), rc.AudioMV, rc.SPL)
	} else if err != nil {
		add("the rig cannot receive it: %v", err)
	}
	if h.MaskedBy != nil {
		add("")
		add("swamped by %s (%.0f kHz)", h.MaskedBy.ID, float64(h.MaskedBy.KHz))
	}
	if t := h.Trap; t != nil {
		add("wave trap: %s, %.0f µH with %.0f pF", t.Kind, t.InductanceUH, t.CapacitancPF)
		add("notch %.0f dB at %.0f kHz, costs the wanted %.1f dB", t.NotchDB, float64(t.AgainstKHz), t.WantedLossDB)
		if t.Advice != "" {
			add("%s", t.Advice)
		}
	}
	add("")
	add("%s", h.Verdict)

	c := g.lay.Card
	// Long lines wrap at spaces to the card's width.
	var wrapped []string
	for i, l := range lines {
		f := g.small
		if i == 0 {
			f = g.bold
		}
		for textWidth(l, f) > c.W-34 {
			cut := len(l)
			for cut > 0 && textWidth(l[:cut], f) > c.W-34 {
				cut = strings.LastIndexByte(l[:cut], ' ')
			}
			if cut <= 0 {
				break
			}
			wrapped = append(wrapped, l[:cut])
			l = "  " + l[cut+1:]
		}
		wrapped = append(wrapped, l)
	}
	lines = wrapped
	c.H = float64(len(lines))*17 + 14
	g.widgets["card"] = c
	fillRect(dst, c, color.RGBA{26, 30, 38, 235})
	strokeRect(dst, c, colAccent)
	for i, l := range lines {
		f, col := g.small, colText
		if i == 0 {
			f, col = g.bold, colAccent
		}
		g.label(dst, fitText(l, f, c.W-34), c.X+10, c.Y+6+float64(i)*17, f, col)
	}
	cl := screen.Rect{X: c.X + c.W - 22, Y: c.Y + 4, W: 18, H: 18}
	g.widgets["card.close"] = cl
	g.label(dst, "×", cl.X+4, cl.Y, g.face, colText)
}

// volts writes a voltage in V or mV, whichever reads better.
func volts(v float64) string {
	if v < 0.1 {
		return fmt.Sprintf("%.2f mV", v*1e3)
	}
	return fmt.Sprintf("%.2f V", v)
}
