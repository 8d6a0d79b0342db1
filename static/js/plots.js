/* Draw every diagram of the page with the local plotly.js and wire its PNG/SVG download buttons.
   The figure JSON sits in a <script type="application/json"> block next to each plot (data, not code). */
(function () {
  "use strict";

  function draw(plot) {
    var source = document.getElementById(plot.dataset.figure);
    if (!source || !window.Plotly) { return null; }
    var figure = JSON.parse(source.textContent);
    var layout = Object.assign({}, figure.layout, { autosize: true });
    return window.Plotly.newPlot(plot, figure.data, layout, {
      responsive: true,
      displaylogo: false,
      modeBarButtonsToRemove: ["select2d", "lasso2d"],
      toImageButtonOptions: { format: "png", filename: plot.dataset.filename || "diagram", width: 900, height: 650 }
    });
  }

  var plots = Array.prototype.slice.call(document.querySelectorAll(".plot[data-figure]"));
  Promise.all(plots.map(draw)).then(function () {
    document.body.dataset.plotsReady = "1";
  });

  document.addEventListener("click", function (event) {
    var button = event.target.closest("button[data-download]");
    if (!button || !window.Plotly) { return; }
    var plot = document.getElementById(button.dataset.target);
    window.Plotly.downloadImage(plot, {
      format: button.dataset.download, filename: plot.dataset.filename || "diagram", width: 900, height: 650
    });
  });

  /* a reference-scale picker redraws at once (the form's submit button does the same without JavaScript) */
  document.querySelectorAll("select[data-autosubmit]").forEach(function (select) {
    select.addEventListener("change", function () { select.form.submit(); });
  });
}());
