// earshot loader. Shows a loading line, gets the app (app.wasm) and runs it
// with Go's wasm_exec.js, then removes the line once the app has set
// globalThis.earshot_ready = true.
//
// Served by "earshot serve", it fetches app.wasm and compiles it while it
// downloads (WebAssembly.instantiateStreaming), then registers the service
// worker sw.js so the page opens again with no server running. In the
// single offline file the app sits in the page itself, in the element
// #earshot-wasm-gz as base64 of its gzip form; it is inflated with
// DecompressionStream and no service worker is used.
"use strict";
(() => {
  const status = document.getElementById("earshot-status");
  const packed = document.getElementById("earshot-wasm-gz");

  function show(text) {
    if (status && status.isConnected) status.textContent = "earshot · " + text;
  }

  function fail(err) {
    console.error("earshot:", err);
    if (!status) return;
    if (!status.isConnected) document.body.append(status);
    status.classList.add("failed");
    status.textContent = "earshot could not go on: " + (err && err.message ? err.message : String(err));
  }

  function megabytes(n) {
    return (n / 1048576).toFixed(1);
  }

  // counted passes a byte stream through unchanged while it reports
  // progress against total (bytes; 0 when unknown).
  function counted(stream, verb, total) {
    let done = 0;
    const report = () => {
      if (total > 0) {
        const pct = Math.min(100, Math.floor((100 * done) / total));
        show(`${verb} ${pct}% (${megabytes(done)} of ${megabytes(total)} MB)`);
      } else {
        show(`${verb} ${megabytes(done)} MB`);
      }
    };
    report();
    return stream.pipeThrough(
      new TransformStream({
        transform(chunk, out) {
          done += chunk.byteLength;
          report();
          out.enqueue(chunk);
        },
        flush() {
          show("compiling");
        },
      }),
    );
  }

  // fromServer fetches app.wasm and compiles it as it arrives. The server
  // sends the decoded size in the Earshot-Wasm-Bytes header, since
  // Content-Length counts gzip bytes.
  async function fromServer(go) {
    const resp = await fetch("app.wasm");
    if (!resp.ok) throw new Error(`app.wasm: HTTP ${resp.status} ${resp.statusText}`);
    const total = Number(resp.headers.get("Earshot-Wasm-Bytes")) || 0;
    const body = new Response(counted(resp.body, "loading", total), {
      headers: { "Content-Type": "application/wasm" },
    });
    if (typeof WebAssembly.instantiateStreaming === "function") {
      const { instance } = await WebAssembly.instantiateStreaming(body, go.importObject);
      return instance;
    }
    const { instance } = await WebAssembly.instantiate(await body.arrayBuffer(), go.importObject);
    return instance;
  }

  function base64Bytes(text) {
    text = text.replace(/\s+/g, "");
    if (typeof Uint8Array.fromBase64 === "function") return Uint8Array.fromBase64(text);
    const bin = atob(text);
    const out = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
    return out;
  }

  // fromPage inflates the app held in the page (single offline file).
  async function fromPage(go) {
    if (typeof DecompressionStream !== "function") {
      throw new Error("this browser has no DecompressionStream; use a current browser");
    }
    show("unpacking");
    const gz = base64Bytes(packed.textContent);
    packed.textContent = ""; // the text is no longer needed
    const total = Number(packed.dataset.bytes) || 0;
    const stream = new Blob([gz]).stream().pipeThrough(new DecompressionStream("gzip"));
    const bytes = await new Response(counted(stream, "unpacking", total)).arrayBuffer();
    const { instance } = await WebAssembly.instantiate(bytes, go.importObject);
    return instance;
  }

  // keepOffline registers the service worker. Browsers offer service
  // workers only in secure contexts (https, or http from localhost and
  // 127.0.0.1); never from file:// nor in the single file.
  function keepOffline() {
    if (packed || !("serviceWorker" in navigator)) return;
    if (location.protocol !== "http:" && location.protocol !== "https:") return;
    navigator.serviceWorker.register("sw.js").then(
      // Look for a new build now rather than whenever the browser gets
      // round to it, so that the next reload shows it. With no server
      // (offline) there is nothing to look for: the copy in hand stays.
      (reg) =>
        reg.update().catch(() => {
          console.info("earshot: offline; the stored copy of the app is in use");
        }),
      (err) => {
        console.warn("earshot: no offline copy:", err);
      },
    );
  }

  function watchReady() {
    const timer = setInterval(() => {
      if (globalThis.earshot_ready === true) {
        clearInterval(timer);
        if (status) status.remove();
      }
    }, 100);
  }

  async function main() {
    if (typeof Go !== "function") throw new Error("wasm_exec.js did not load");
    const go = new Go();
    const instance = await (packed ? fromPage(go) : fromServer(go));
    show("starting");
    keepOffline();
    watchReady();
    await go.run(instance);
    throw new Error("the app stopped; reload the page to start it again");
  }

  main().catch(fail);
})();
