// Alvea: applies the saved theme before the page is drawn, so a start at
// night never flashes the day colours (the app itself starts later). Loaded
// without defer on purpose. Reads only the theme from the saved settings.
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
