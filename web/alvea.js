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
