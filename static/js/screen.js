/* The screen page: re-rank on every change without a reload, keep the scenario in the URL, and save shortlists.
   The page works without this script (plain GET/POST forms); this only makes it live. The server parses the
   query string and renders the ranked rows (GET /screen/ranking, the same template as the page): this script only
   swaps those pieces in by id. It never ranks, formats a number or maps the form to a scenario itself. */
(function () {
  "use strict";

  var form = document.getElementById("scenario-form");
  if (!form) { return; }
  var body = document.body;
  var statusLine = document.getElementById("screen-status");
  var saveForm = document.getElementById("save-form");
  var saveStatus = document.getElementById("save-status");
  var results = document.getElementById("results");
  var sequence = 0;
  var timer = null;
  var inflight = null;  // the AbortController of the request still on its way, if any
  var QUIET_MS = 60;    // wait this long after the last keystroke, so a typed number is sent once

  /* the pieces GET /screen/ranking renders, each with the id the page gives it */
  var PIECES = ["scenario-line", "rule-text", "conditions-text", "temperature-notes", "gas-notes",
                "row-count", "ranking-body", "notes", "electrolyte-readout", "warnings"];

  /* ---- the view state: form -> query string ---- */
  function viewParams() {
    var params = new URLSearchParams();
    new FormData(form).forEach(function (value, name) {
      if (name === "compare") { return; }
      var text = String(value).trim();
      if (text === "" && name !== "ph_high" && name !== "potential_high") { return; }
      params.append(name, text);
    });
    return params;
  }

  /* ---- placing what the server rendered ---- */
  function el(tag, className, text) {
    var node = document.createElement(tag);
    if (className) { node.className = className; }
    if (text !== undefined && text !== null) { node.textContent = text; }
    return node;
  }

  function place(fragment, ids) {
    ids.forEach(function (id) {
      var fresh = fragment.getElementById(id);
      var old = document.getElementById(id);
      if (fresh && old) { old.replaceWith(document.importNode(fresh, true)); }
    });
  }

  /* each message goes to its field (aria-invalid plus the message element after it), shown once; a message
     whose field is not on the form stays in the box above the results */
  function placeErrors(fragment) {
    form.querySelectorAll("[aria-invalid]").forEach(function (input) { input.removeAttribute("aria-invalid"); });
    form.querySelectorAll(".field-error").forEach(function (line) { line.textContent = ""; line.hidden = true; });
    var box = document.getElementById("errors");
    var list = document.getElementById("error-list");
    list.textContent = "";
    var items = fragment ? fragment.querySelectorAll("#error-list li") : [];
    Array.prototype.forEach.call(items, function (item) {
      var field = item.dataset.field;
      var line = field ? form.querySelector(".field-error[data-error-for~='" + field + "']") : null;
      var inputs = field ? form.querySelectorAll("[name='" + field + "']") : [];
      inputs.forEach(function (input) { input.setAttribute("aria-invalid", "true"); });
      if (line) {
        line.textContent = (line.textContent ? line.textContent + " " : "") + item.textContent.trim();
        line.hidden = false;
        var fold = line.closest("details");
        if (fold) { fold.open = true; }
      } else {
        list.appendChild(document.importNode(item, true));
      }
    });
    box.hidden = list.children.length === 0;
    results.dataset.stale = items.length ? "1" : "0";
  }

  /* the view state the server does not know: which rows are ticked for comparison, the notes typed so far */
  function keepTicksAndNotes(update) {
    var ticked = {};
    document.querySelectorAll("#ranking-body input[name=compare]").forEach(function (box) { ticked[box.value] = box.checked; });
    var typed = {};
    document.querySelectorAll("#notes textarea").forEach(function (area) { typed[area.name] = area.value; });
    update();
    var boxes = document.querySelectorAll("#ranking-body input[name=compare]");
    var keep = Array.prototype.some.call(boxes, function (box) { return ticked[box.value]; });
    if (keep) { boxes.forEach(function (box) { box.checked = Boolean(ticked[box.value]); }); }
    document.querySelectorAll("#notes textarea").forEach(function (area) { area.value = typed[area.name] || ""; });
  }

  function updateLinks(query) {
    var suffix = query ? "?" + query : "";
    history.replaceState(null, "", form.dataset.page + suffix);
    document.getElementById("csv-link").href = form.dataset.csv + suffix;
    document.getElementById("picture-svg").href = document.getElementById("picture-frame").dataset.picture + suffix;
    if (document.getElementById("picture-box").open) { showPicture(); }
    document.getElementById("json-link").href = form.dataset.json + suffix;
    var twin = document.querySelector("link[rel=alternate][type='application/json']");
    if (twin) { twin.href = form.dataset.json + suffix; }
    var footerTwin = document.getElementById("json-twin-link");
    if (footerTwin) { footerTwin.href = form.dataset.json + suffix; }
    saveForm.querySelectorAll("[data-scenario-copy]").forEach(function (input) { input.remove(); });
    new URLSearchParams(query).forEach(function (value, name) {
      var hidden = el("input");
      hidden.type = "hidden"; hidden.name = name; hidden.value = value;
      hidden.setAttribute("data-scenario-copy", "");
      saveForm.appendChild(hidden);
    });
  }

  /* the picture of the ranking, for the scenario now in the form (made when first wanted) */
  function showPicture() {
    var picture = document.getElementById("ranking-picture");
    if (!picture) {
      picture = el("img");
      picture.id = "ranking-picture";
      picture.alt = "For each ranked candidate, a strip of the operating window split by stable phase, with its verdict in words";
      document.getElementById("picture-frame").appendChild(picture);
    }
    var wanted = document.getElementById("picture-svg").href;
    if (picture.src !== wanted) { picture.src = wanted; }
  }

  /* ---- running the screen ---- */
  function rerun() {
    var query = viewParams().toString();
    updateLinks(query);
    var mine = ++sequence;
    if (inflight) { inflight.abort(); }  // a newer scenario makes the older answer useless
    var controller = window.AbortController ? new AbortController() : null;
    inflight = controller;
    body.dataset.busy = "1";
    statusLine.textContent = "Screening\u2026";
    return fetch(form.dataset.ranking + (query ? "?" + query : ""),
                 { headers: { "Accept": "text/html" }, signal: controller ? controller.signal : undefined })
      .then(function (response) {
        return response.text().then(function (text) { return { ok: response.ok, text: text }; });
      }).then(function (answer) {
        if (mine !== sequence) { return; }
        var fragment = new DOMParser().parseFromString(answer.text, "text/html");
        if (answer.ok) {
          keepTicksAndNotes(function () { place(fragment, PIECES); });
          statusLine.textContent = "Ranked " + document.getElementById("row-count").textContent + " candidates.";
          document.dispatchEvent(new CustomEvent("electrosieve:ranked"));
        } else {
          statusLine.textContent = "Not ranked: the ranking below is hidden until the marked fields are valid.";
        }
        placeErrors(fragment);
      }).catch(function (error) {
        if (error && error.name === "AbortError") { return; }
        if (mine === sequence) { statusLine.textContent = "Could not reach the server: " + error; }
      }).then(function () {
        if (mine === sequence) {
          inflight = null;
          body.dataset.busy = "0";
          body.dataset.updates = String(Number(body.dataset.updates || "0") + 1);
        }
      });
  }

  function soon() {
    clearTimeout(timer);
    timer = setTimeout(rerun, QUIET_MS);
  }

  /* the compare button says at once when the ticks are outside 1 to 6 (the compare page would say it too) */
  var compareCount = document.getElementById("compare-count");
  function countTicks() {
    var ticked = document.querySelectorAll("#ranking-body input[name=compare]:checked").length;
    var low = Number(compareCount.dataset.low), high = Number(compareCount.dataset.high);
    var fine = ticked >= low && ticked <= high;
    compareCount.textContent = fine ? ticked + " ticked (1 to 6)" :
      (ticked > high ? ticked + " ticked: untick " + (ticked - high) + " (at most " + high + ")" : "tick at least one");
    compareCount.classList.toggle("field-error", !fine);
    document.getElementById("compare-button").setAttribute("aria-disabled", fine ? "false" : "true");
    return fine;
  }
  document.getElementById("compare-button").addEventListener("click", function (event) {
    if (!countTicks()) { event.preventDefault(); }
  });
  document.addEventListener("electrosieve:ranked", countTicks);
  document.getElementById("ranking").addEventListener("change", countTicks);
  countTicks();

  form.addEventListener("change", function (event) {
    if (event.target && event.target.name === "compare") { countTicks(); return; }
    clearTimeout(timer);
    rerun();
  });
  form.addEventListener("input", function (event) {
    if (event.target && event.target.type === "text") { soon(); }
  });
  form.addEventListener("submit", function (event) {
    var submitter = event.submitter;
    if (submitter && submitter.getAttribute("formaction")) { return; }  // "Compare ticked" opens the compare page
    event.preventDefault();
    clearTimeout(timer);
    rerun();
  });

  /* ---- the selected candidate's diagram beside (laptop) or under (phone) the ranking ---- */
  var selectedMaterial = (document.querySelector("#ranking-body tr.is-selected") || {}).dataset;
  selectedMaterial = selectedMaterial ? selectedMaterial.material : null;
  var figureRequest = null;

  function markSelected() {
    var rows = document.querySelectorAll("#ranking-body tr[data-material]");
    var found = false;
    rows.forEach(function (row) {
      var on = row.dataset.material === selectedMaterial;
      found = found || on;
      row.classList.toggle("is-selected", on);
      if (on) { row.setAttribute("aria-current", "true"); } else { row.removeAttribute("aria-current"); }
    });
    if (!found && rows.length) {  // the chosen candidate left the ranking: show the first one
      selectedMaterial = rows[0].dataset.material;
      rows[0].classList.add("is-selected");
      rows[0].setAttribute("aria-current", "true");
    }
  }

  function showSelected() {
    if (!selectedMaterial) { return Promise.resolve(); }
    if (figureRequest) { figureRequest.abort(); }
    var controller = window.AbortController ? new AbortController() : null;
    figureRequest = controller;
    var params = viewParams();
    params.set("material", selectedMaterial);
    return fetch(form.dataset.diagram + "?" + params.toString(),
          { headers: { "Accept": "text/html" }, signal: controller ? controller.signal : undefined })
      .then(function (response) { return response.text(); })
      .then(function (text) {
        var fragment = new DOMParser().parseFromString(text, "text/html");
        place(fragment, ["selected-figure"]);
        var plot = document.getElementById("plot-selected");
        if (plot && window.electrosievePlots) { return window.electrosievePlots.draw(plot); }
        return null;
      }).then(function () {
        document.body.dataset.selectedReady = selectedMaterial;
      }).catch(function (error) {
        if (!error || error.name !== "AbortError") { statusLine.textContent = "Could not draw the diagram: " + error; }
      });
  }

  /* where the diagram is not beside the list (a phone), bring it into view once the new one is drawn */
  var stacked = window.matchMedia ? window.matchMedia("(max-width: 74.99rem)") : { matches: false };

  function choose(row) {
    if (!row || !row.dataset.material) { return; }
    selectedMaterial = row.dataset.material;
    markSelected();
    showSelected().then(function () {
      if (stacked.matches) { document.getElementById("selected-figure").scrollIntoView({ block: "start" }); }
    });
  }

  var rankingTable = document.getElementById("ranking");
  rankingTable.addEventListener("click", function (event) {
    if (event.target.closest("a, input, label, button")) { return; }  // links and ticks keep their own meaning
    choose(event.target.closest("tr[data-material]"));
  });
  rankingTable.addEventListener("keydown", function (event) {
    if ((event.key === "Enter" || event.key === " ") && event.target.matches("tr[data-material]")) {
      event.preventDefault();
      choose(event.target);
    }
  });
  document.addEventListener("electrosieve:ranked", function () { markSelected(); showSelected(); });

  /* ---- the picture of the ranking: drawn by the server as SVG; PNG made here, in the browser ---- */
  var pictureBox = document.getElementById("picture-box");
  pictureBox.addEventListener("toggle", function () { if (pictureBox.open) { showPicture(); } });
  document.getElementById("picture-png").addEventListener("click", function () {
    var source = document.getElementById("picture-svg").href;
    fetch(source).then(function (response) { return response.text(); }).then(function (text) {
      var image = new Image();
      var blobUrl = URL.createObjectURL(new Blob([text], { type: "image/svg+xml" }));
      image.onload = function () {
        var canvas = document.createElement("canvas");
        canvas.width = image.width * 2; canvas.height = image.height * 2;  // sharp on paper and high-density screens
        var context = canvas.getContext("2d");
        context.scale(2, 2);
        context.drawImage(image, 0, 0);
        URL.revokeObjectURL(blobUrl);
        canvas.toBlob(function (blob) {
          var link = el("a");
          link.href = URL.createObjectURL(blob);
          link.download = "electrosieve-ranking.png";
          document.body.appendChild(link);
          link.click();
          link.remove();
        }, "image/png");
      };
      image.src = blobUrl;
    });
  });

  /* ---- saving a shortlist ---- */
  saveForm.addEventListener("submit", function (event) {
    event.preventDefault();
    var scenario = JSON.parse(document.getElementById("ranking-body").dataset.scenario || "null");
    if (!scenario) { saveStatus.textContent = "Not saved: screen a valid scenario first."; return; }
    var notes = {};
    document.querySelectorAll("#notes textarea").forEach(function (area) {
      if (area.value.trim()) { notes[area.name.replace(/^note_/, "")] = area.value; }
    });
    var title = document.getElementById("title").value;
    saveStatus.textContent = "Saving\u2026";
    fetch(form.dataset.apiShortlists, {
      method: "POST", headers: { "Content-Type": "application/json", "Accept": "application/json" },
      body: JSON.stringify({ title: title, scenario: scenario, notes: notes })
    }).then(function (response) {
      return response.json().then(function (data) { return { ok: response.ok, data: data }; });
    }).then(function (answer) {
      saveStatus.textContent = "";
      if (!answer.ok) {
        var detail = answer.data.detail;
        saveStatus.textContent = "Not saved: " + (Array.isArray(detail) ? detail.map(function (item) { return item.msg; })
          .join("; ") : String(detail));
        return;
      }
      var link = el("a", null, new URL(answer.data.url, window.location.href).href);
      link.href = answer.data.url;
      link.id = "shortlist-link";
      saveStatus.appendChild(document.createTextNode("Saved. Share this link: "));
      saveStatus.appendChild(link);
    }).catch(function (error) {
      saveStatus.textContent = "Could not reach the server: " + error;
    });
  });

  body.dataset.ready = "1";
  if (window.performance && performance.mark) { performance.mark("electrosieve-ready"); }
}());
