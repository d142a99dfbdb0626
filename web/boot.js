// Alvea: the first script of every page, ahead of the style sheets (the
// server puts it there), loaded without defer on purpose.
//
// 1. Applies the saved theme before the page is drawn, so a start at night
//    never flashes the day colours (the app itself starts later). Reads
//    only the theme from the saved settings.
// 2. Starts compiling app.wasm at once. go-app's loader (app.js, a deferred
//    script) would only start once the whole page is parsed and styled; app.js (as
//    Alvea serves it, see app/server/loader.go) takes the module compiled
//    here. Served by the service worker (a warm start), app.wasm is passed
//    to the compiler as fetched, so the browser can keep and reuse the
//    compiled code. On a first visit the bytes are counted for go-app's
//    progress label.
(function () {
  "use strict";
  try {
    var saved = JSON.parse(window.localStorage.getItem("alvea.settings") || "null");
    var theme = saved && saved.Value && saved.Value.theme;
    if (theme === "day" || theme === "night") {
      document.documentElement.setAttribute("data-theme", theme);
    }
  } catch (e) {
    // No saved settings, or storage unavailable: the day theme stands.
  }
})();

(function () {
  "use strict";
  if (window.alveaWasm !== undefined || !WebAssembly.compileStreaming) {
    return; // app.js went first, or this browser has no streaming compile
  }
  if (/bot|googlebot|crawler|spider|robot|crawling/i.test(navigator.userAgent) ||
      new URLSearchParams(window.location.search).get("wasm") === "false") {
    return; // go-app loads no app.wasm for these
  }
  var url = "/web/app.wasm";
  var controlled = navigator.serviceWorker && navigator.serviceWorker.controller;
  var response = controlled ? fetch(url) : fetch(url).then(counted);
  window.alveaWasm = WebAssembly.compileStreaming(response);
  // A failure here is handled by app.js, which loads app.wasm again.
  window.alveaWasm.catch(function () {});

  // counted passes the body on, showing the share received in go-app's
  // loading label.
  function counted(resp) {
    if (!resp.ok || !resp.body) {
      return resp;
    }
    var loaded = 0;
    var reader = resp.body.getReader();
    var body = new ReadableStream({
      pull: function (controller) {
        return reader.read().then(function (r) {
          if (r.done) {
            controller.close();
            return;
          }
          loaded += r.value.byteLength;
          show(loaded);
          controller.enqueue(r.value);
        });
      }
    });
    return new Response(body, { status: resp.status, statusText: resp.statusText, headers: resp.headers });
  }

  // show writes the share of app.wasm received, against its decoded size
  // (go-app's app.js holds it, once that has run; the copy sent may be
  // compressed, so Content-Length would not do).
  function show(loaded) {
    var label = document.getElementById("app-wasm-loader-label");
    if (!label || typeof goappLoadingLabel !== "string" || typeof goappWasmContentLength !== "string") {
      return;
    }
    var total = parseInt(goappWasmContentLength, 10);
    if (total > 0) {
      label.innerText = goappLoadingLabel.replace("{progress}", Math.min(100, Math.round(loaded * 100 / total)));
    }
  }
})();
