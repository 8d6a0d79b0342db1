/* Draw every diagram of the page with the local plotly.js and wire its PNG/SVG download buttons.
   The figure JSON sits in a <script type="application/json"> block next to each plot (data, not code).
   Nothing here reaches beyond this machine: the toolbar keeps zoom, pan, reset and the image download only. */
(function () {
  "use strict";

  var IMAGE = { width: 900, height: 650 };
  var CONFIG = {
    responsive: true,
    displaylogo: false,
    showSendToCloud: false,
    showEditInChartStudio: false,
    showLink: false,
    modeBarButtonsToRemove: ["select2d", "lasso2d", "sendDataToCloud", "editInChartStudio", "toggleSpikelines"]
  };

  /* a readout under the plot: where the pointer is, in pH and in volts on the plot's own scale */
  function readout(plot) {
    if (plot.nextElementSibling && plot.nextElementSibling.classList.contains("plot-readout")) { return; }  // redrawn
    var line = document.createElement("p");
    line.className = "plot-readout";
    line.setAttribute("aria-live", "off");
    line.textContent = "\u00A0";
    plot.insertAdjacentElement("afterend", line);
    var unit = ((plot.layout.yaxis.title || {}).text || "").replace(/^E \/ /, "");
    plot.addEventListener("mousemove", function (event) {
      var full = plot._fullLayout;
      if (!full || !full.xaxis) { return; }
      var box = plot.querySelector(".nsewdrag");
      if (!box) { return; }
      var area = box.getBoundingClientRect();
      var px = event.clientX - area.left;
      var py = event.clientY - area.top;
      if (px < 0 || py < 0 || px > area.width || py > area.height) { line.textContent = "\u00A0"; return; }
      line.textContent = "pH " + full.xaxis.p2l(px).toFixed(2) + " \u00B7 E " + full.yaxis.p2l(py).toFixed(3) + " " + unit;
    });
  }

  function draw(plot) {
    var source = document.getElementById(plot.dataset.figure);
    if (!source || !window.Plotly) { return null; }
    var figure = JSON.parse(source.textContent);
    var layout = Object.assign({}, figure.layout, { autosize: true });
    var config = Object.assign({}, CONFIG, {
      toImageButtonOptions: Object.assign({ format: "png", filename: plot.dataset.filename || "diagram" }, IMAGE)
    });
    return window.Plotly.newPlot(plot, figure.data, layout, config).then(readout);
  }

  /* a page script that places a server-built figure later (the screen page's selected candidate) draws it here */
  window.electrosievePlots = { draw: draw };

  var plots = Array.prototype.slice.call(document.querySelectorAll(".plot[data-figure]"));
  Promise.all(plots.map(draw)).then(function () {
    document.body.dataset.plotsReady = "1";
  });

  document.addEventListener("click", function (event) {
    var button = event.target.closest("button[data-download]");
    if (!button || !window.Plotly) { return; }
    var plot = document.getElementById(button.dataset.target);
    window.Plotly.downloadImage(plot, Object.assign({
      format: button.dataset.download, filename: plot.dataset.filename || "diagram"
    }, IMAGE));
  });

  /* a reference-scale picker redraws at once (the form's submit button does the same without JavaScript) */
  document.querySelectorAll("select[data-autosubmit]").forEach(function (select) {
    select.addEventListener("change", function () { select.form.submit(); });
  });
}());
