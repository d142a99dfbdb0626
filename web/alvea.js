// Alvea page script: offers a new version and applies it only when the crew
// accepts. The service worker (app-worker.js) never activates a new version
// by itself; a new version installs and waits. This script tells the app
// (through go-app's update hook) that one is waiting, and when the crew taps
// "Update now" it asks the waiting worker to take over, then reloads.
(function () {
  "use strict";
  if (!("serviceWorker" in navigator)) {
    window.alveaUpdateWaiting = function () { return false; };
    return;
  }

  let registration = null;
  let accepted = false;

  function announce() {
    if (registration && registration.waiting && navigator.serviceWorker.controller) {
      if (typeof window.goappOnUpdate === "function") {
        window.goappOnUpdate();
      }
    }
  }

  function watch(reg) {
    registration = reg;
    announce();
    reg.addEventListener("updatefound", function () {
      const worker = reg.installing;
      if (!worker) {
        return;
      }
      worker.addEventListener("statechange", function () {
        if (worker.state === "installed") {
          announce();
        }
      });
    });
  }

  // True when a new version is installed and waiting for the crew.
  window.alveaUpdateWaiting = function () {
    return !!(registration && registration.waiting && navigator.serviceWorker.controller);
  };

  // Called when the crew accepts the update.
  window.alveaApplyUpdate = function () {
    if (!registration || !registration.waiting) {
      return false;
    }
    accepted = true;
    registration.waiting.postMessage({ type: "alvea:activate" });
    return true;
  };

  navigator.serviceWorker.addEventListener("controllerchange", function () {
    // The first install also changes the controller (clients.claim); only
    // an accepted update reloads the page.
    if (accepted) {
      accepted = false;
      window.location.reload();
    }
  });

  navigator.serviceWorker.ready.then(watch);
})();

// The Brief's result panel written directly (app/ui/brief_result.go,
// panelPack): packed holds records separated by U+001E; a record is
// "id U+001F text" (the text of the element's only child, a text node) or
// "id U+001F value U+001F attribute" (an empty value removes the
// attribute). Only what differs is set. The text
// goes into the existing text node (nodeValue), never through textContent
// or innerHTML, which would replace the node the app holds. Returns false
// when an element is missing or holds anything but one text node; every
// other record is still written.
(function () {
  "use strict";
  window.alveaSetTexts = function (packed) {
    let ok = true;
    let start = 0;
    const end = packed.length;
    while (start < end) {
      let stop = packed.indexOf("\u001e", start);
      if (stop < 0) {
        stop = end;
      }
      const a = packed.indexOf("\u001f", start);
      if (a < 0 || a > stop) {
        ok = false;
        start = stop + 1;
        continue;
      }
      const el = document.getElementById(packed.slice(start, a));
      let b = packed.indexOf("\u001f", a + 1);
      if (b > stop) {
        b = -1;
      }
      if (!el) {
        ok = false;
      } else if (b < 0) {
        const value = packed.slice(a + 1, stop);
        const node = el.firstChild;
        if (!node || node !== el.lastChild || node.nodeType !== Node.TEXT_NODE) {
          ok = false;
        } else if (node.nodeValue !== value) {
          node.nodeValue = value;
        }
      } else {
        const value = packed.slice(a + 1, b);
        const name = packed.slice(b + 1, stop);
        if (value === "") {
          if (el.hasAttribute(name)) {
            el.removeAttribute(name);
          }
        } else if (el.getAttribute(name) !== value) {
          el.setAttribute(name, value);
        }
      }
      start = stop + 1;
    }
    return ok;
  };
})();
