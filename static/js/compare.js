/* The compare page: switching the potential axis redraws every diagram in place. The server builds the figures
   (GET /compare.json with the new axis, the page's JSON twin); this script only swaps each figure in and keeps
   the address bar, the twin link and the material links on the new axis. Without it the form reloads the page. */
(function () {
  "use strict";

  var form = document.getElementById("axis-form");
  var select = form && form.querySelector("select[name=axis]");
  if (!select || !window.fetch) { return; }
  var status = document.getElementById("axis-status");
  var inflight = null;

  select.addEventListener("change", function (event) {
    event.stopImmediatePropagation();  // no reload: plots.js would submit the form
    var query = new URLSearchParams(new FormData(form)).toString();
    if (inflight) { inflight.abort(); }
    inflight = window.AbortController ? new AbortController() : null;
    status.textContent = "Redrawing\u2026";
    fetch(form.dataset.json + "?" + query, { headers: { "Accept": "application/json" },
                                            signal: inflight ? inflight.signal : undefined })
      .then(function (response) {
        return response.json().then(function (data) { return { ok: response.ok, data: data }; });
      }).then(function (answer) {
        if (!answer.ok) {
          var detail = answer.data.detail;
          status.textContent = "Not redrawn: " + (Array.isArray(detail) ? detail.map(function (d) { return d.msg; }).join("; ") : detail);
          return null;
        }
        var page = answer.data;
        return Promise.all(page.diagrams.map(function (d) {
          var source = document.getElementById("figure-" + d.material);
          var plot = document.getElementById("plot-" + d.material);
          if (!source || !plot) { return null; }
          source.textContent = JSON.stringify(d.figure);
          document.querySelectorAll("a[data-material-link='" + d.material + "']").forEach(function (link) {
            link.href = d.links.material;
          });
          return window.electrosievePlots.draw(plot);
        })).then(function () {
          history.replaceState(null, "", page.links.page);
          var twin = document.querySelector("link[rel=alternate][type='application/json']");
          if (twin) { twin.href = page.links.json_twin; }
          status.textContent = "Potential axis: " + select.options[select.selectedIndex].text + ".";
          document.body.dataset.axis = page.axis;
        });
      }).catch(function (error) {
        if (!error || error.name !== "AbortError") { status.textContent = "Could not reach the server: " + error; }
      });
  }, true);
}());
