/* Before printing: open the cautions and every closed detail of the results, and stamp the date of printing. */
(function () {
  "use strict";
  window.addEventListener("beforeprint", function () {
    document.querySelectorAll(".cautions details, .results-panel details").forEach(function (box) { box.open = true; });
    document.querySelectorAll("[data-print-date]").forEach(function (stamp) {
      stamp.textContent = new Date().toLocaleString(undefined, { dateStyle: "long", timeStyle: "short" });
    });
  });
}());
