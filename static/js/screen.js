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
  var sequence = 0;
  var timer = null;

  /* the pieces GET /screen/ranking renders, each with the id the page gives it */
  var PIECES = ["errors", "scenario-line", "rule-text", "conditions-text", "temperature-notes", "gas-notes",
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

  function markInvalid() {
    form.querySelectorAll("[aria-invalid]").forEach(function (input) { input.removeAttribute("aria-invalid"); });
    document.querySelectorAll("#error-list li[data-field]").forEach(function (item) {
      var input = form.querySelector("[name='" + item.dataset.field + "']");
      if (input) { input.setAttribute("aria-invalid", "true"); }
    });
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

  /* ---- running the screen ---- */
  function rerun() {
    var query = viewParams().toString();
    updateLinks(query);
    var mine = ++sequence;
    body.dataset.busy = "1";
    statusLine.textContent = "Screening\u2026";
    return fetch(form.dataset.ranking + (query ? "?" + query : ""), { headers: { "Accept": "text/html" } })
      .then(function (response) {
        return response.text().then(function (text) { return { ok: response.ok, text: text }; });
      }).then(function (answer) {
        if (mine !== sequence) { return; }
        var fragment = new DOMParser().parseFromString(answer.text, "text/html");
        if (answer.ok) {
          keepTicksAndNotes(function () { place(fragment, PIECES); });
          statusLine.textContent = "Ranked " + document.getElementById("row-count").textContent + " candidates.";
        } else {
          place(fragment, ["errors"]);
          statusLine.textContent = "Not ranked: see the messages above.";
        }
        markInvalid();
      }).catch(function (error) {
        if (mine === sequence) { statusLine.textContent = "Could not reach the server: " + error; }
      }).then(function () {
        if (mine === sequence) {
          body.dataset.busy = "0";
          body.dataset.updates = String(Number(body.dataset.updates || "0") + 1);
        }
      });
  }

  function soon() {
    clearTimeout(timer);
    timer = setTimeout(rerun, 350);
  }

  form.addEventListener("change", function (event) {
    if (event.target && event.target.name === "compare") { return; }
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
