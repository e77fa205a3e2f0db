//go:build js

package main

import (
	"sync"
	"syscall/js"
)

// The browser's local storage, for the listener's choices.

const storageKey = "earshot.app.state"

func storageGet() (string, bool) {
	ls := js.Global().Get("localStorage")
	if !ls.Truthy() {
		return "", false
	}
	v := ls.Call("getItem", storageKey)
	if v.IsNull() || v.IsUndefined() {
		return "", false
	}
	return v.String(), true
}

func storageSet(v string) {
	if ls := js.Global().Get("localStorage"); ls.Truthy() {
		ls.Call("setItem", storageKey, v)
	}
}

func storageRemove() {
	if ls := js.Global().Get("localStorage"); ls.Truthy() {
		ls.Call("removeItem", storageKey)
	}
}

// picked is a file the listener chose, read in a browser callback and
// taken by Update.
type picked struct {
	name string
	data []byte
	err  string
}

var (
	pickedMu sync.Mutex
	pickedQ  []picked
)

// pickFile opens the browser's file picker for a scenario (.json) or a
// station list (.csv); the file arrives through takePicked.
func pickFile() {
	doc := js.Global().Get("document")
	in := doc.Call("createElement", "input")
	in.Set("type", "file")
	in.Set("accept", ".json,.csv,application/json,text/csv")
	var onChange js.Func
	onChange = js.FuncOf(func(this js.Value, args []js.Value) any {
		defer onChange.Release()
		files := in.Get("files")
		if files.Get("length").Int() == 0 {
			return nil
		}
		f := files.Index(0)
		name := f.Get("name").String()
		if size := f.Get("size").Int(); size > 20<<20 {
			pushPicked(picked{name: name, err: "the file is larger than 20 MB"})
			return nil
		}
		var then, fail js.Func
		then = js.FuncOf(func(this js.Value, args []js.Value) any {
			defer then.Release()
			defer fail.Release()
			u8 := js.Global().Get("Uint8Array").New(args[0])
			b := make([]byte, u8.Get("length").Int())
			js.CopyBytesToGo(b, u8)
			pushPicked(picked{name: name, data: b})
			return nil
		})
		fail = js.FuncOf(func(this js.Value, args []js.Value) any {
			defer then.Release()
			defer fail.Release()
			pushPicked(picked{name: name, err: "the file could not be read"})
			return nil
		})
		f.Call("arrayBuffer").Call("then", then, fail)
		return nil
	})
	in.Call("addEventListener", "change", onChange)
	in.Call("click")
}

func pushPicked(p picked) {
	pickedMu.Lock()
	pickedQ = append(pickedQ, p)
	pickedMu.Unlock()
}

func takePicked() []picked {
	pickedMu.Lock()
	defer pickedMu.Unlock()
	q := pickedQ
	pickedQ = nil
	return q
}

// The test hook: the page's script and the browser tests read the app's
// state through these globals.
//
//	earshot_ready      true once the first prediction is on screen
//	earshot_state()    the state as JSON (see stateJSON)
//	earshot_draws()    frames drawn so far
//	earshot_project(lat, lon)  the CSS pixel of a place on the map, [x, y]
type hook struct {
	mu      sync.Mutex
	state   func() string
	draws   int
	ready   bool
	project func(lat, lon float64) (float64, float64)
}

var theHook hook

func installHook() {
	g := js.Global()
	g.Set("earshot_ready", false)
	g.Set("earshot_state", js.FuncOf(func(this js.Value, args []js.Value) any {
		theHook.mu.Lock()
		state := theHook.state
		theHook.mu.Unlock()
		if state == nil {
			return `{"ready":false}`
		}
		return state()
	}))
	g.Set("earshot_draws", js.FuncOf(func(this js.Value, args []js.Value) any {
		theHook.mu.Lock()
		defer theHook.mu.Unlock()
		return theHook.draws
	}))
	g.Set("earshot_project", js.FuncOf(func(this js.Value, args []js.Value) any {
		if len(args) != 2 {
			return nil
		}
		theHook.mu.Lock()
		p := theHook.project
		theHook.mu.Unlock()
		if p == nil {
			return nil
		}
		x, y := p(args[0].Float(), args[1].Float())
		return []any{x, y}
	}))
}

func hookPublish(state func() string, draws int, ready bool, project func(lat, lon float64) (float64, float64)) {
	theHook.mu.Lock()
	theHook.state, theHook.draws, theHook.project = state, draws, project
	was := theHook.ready
	theHook.ready = ready
	theHook.mu.Unlock()
	if ready && !was {
		js.Global().Set("earshot_ready", true)
	}
}

// navMs returns milliseconds since the page's navigation began
// (performance.now()).
func navMs() float64 {
	if p := js.Global().Get("performance"); p.Truthy() {
		return p.Call("now").Float()
	}
	return 0
}
