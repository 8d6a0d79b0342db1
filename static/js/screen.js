/* The screen page: re-run the screen on every change without a reload, keep the scenario in the URL,
   and save shortlists. The page works without this script (plain GET/POST forms); this only makes it live.
   All text from the server is inserted with textContent, never as HTML. */
(function () {
  "use strict";

  var form = document.getElementById("scenario-form");
  if (!form) { return; }
  var body = document.body;
  var tbody = document.getElementById("ranking-body");
  var statusLine = document.getElementById("screen-status");
  var errorsBox = document.getElementById("errors");
  var errorList = document.getElementById("error-list");
  var saveForm = document.getElementById("save-form");
  var saveStatus = document.getElementById("save-status");
  var notesBox = document.getElementById("notes");
  var sequence = 0;
  var timer = null;
  var lastResult = null;

  var RANGE_FIELDS = { ph: ["ph_low", "ph_high"], potential: ["potential_low", "potential_high"] };
  var BODY_TO_FIELD = { ph: "ph_low", potential: "potential_low" };
  var GAS_WORDS = { H2: "H\u2082 evolves (see above)", O2: "O\u2082 evolves (see above)" };
  var MARKS = { "acceptable": "\u2713", "partly acceptable": "\u25D0", "rejected": "\u2715" };

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

  function numberOrText(text) {
    if (text === "") { return null; }
    var value = Number(text);
    return (isFinite(value) && /^[\s+\-0-9.eE]+$/.test(text)) ? value : text;  // the server names a bad field
  }

  function picked(params) {
    var pick = params.get("pick");
    if (pick === "all" || pick === "family" || pick === "names") { return pick; }
    if (params.getAll("materials").length) { return "names"; }
    return params.get("family") ? "family" : "all";
  }

  /* ---- query string -> the scenario body of POST /api/v1/screen (the same mapping as the server's ViewQuery) ---- */
  function scenarioBody(params) {
    var scenario = {};
    Object.keys(RANGE_FIELDS).forEach(function (key) {
      var low = numberOrText((params.get(RANGE_FIELDS[key][0]) || "").trim());
      var high = numberOrText((params.get(RANGE_FIELDS[key][1]) || "").trim());
      scenario[key] = high === null ? low : [low, high];
    });
    scenario.scale = params.get("scale") || "SHE";
    scenario.temperature = numberOrText(params.get("temperature") || "25");
    scenario.activity = numberOrText(params.get("activity") || "1e-6");
    scenario.role = params.get("role") || "anode";
    var accept = params.getAll("accept");
    if (accept.length) { scenario.accept = accept; }
    var pick = picked(params);
    if (pick === "names") { scenario.materials = params.getAll("materials"); }
    if (pick === "family" && params.get("family")) { scenario.family = params.get("family"); }
    var rankBy = (params.get("rank_by") || "").split(",").map(function (s) { return s.trim().toLowerCase(); })
      .filter(Boolean);
    if (rankBy.length) { scenario.rank_by = rankBy; }
    var weights = (params.get("weights") || "").trim();
    if (weights) {
      scenario.weights = {};
      weights.split(",").forEach(function (part) {
        var pieces = part.replace("=", ":").split(":");
        scenario.weights[pieces[0].trim().toLowerCase()] = numberOrText((pieces[1] || "").trim());
      });
    }
    return scenario;
  }

  function localProblems(params) {
    var pick = picked(params);
    if (pick === "names" && !params.getAll("materials").length) {
      return [{ field: "materials", msg: "materials: tick at least one material, or pick all" }];
    }
    if (pick === "family" && !params.get("family")) {
      return [{ field: "family", msg: "family: choose a family, or pick all" }];
    }
    return [];
  }

  /* ---- rendering ---- */
  function el(tag, className, text) {
    var node = document.createElement(tag);
    if (className) { node.className = className; }
    if (text !== undefined && text !== null) { node.textContent = text; }
    return node;
  }

  /* Numbers as the server's templates print them (Python's format(): exact ties round half to even). */
  function fixed(value, digits) {
    if (value === null || value === undefined) { return "\u2013"; }
    var x = Number(value);
    var scale = Math.pow(10, digits);
    var scaled = Math.abs(x) * scale;
    var text;
    if (scaled % 1 === 0.5) {
      var low = Math.floor(scaled);
      text = ((low % 2 === 0 ? low : low + 1) / scale).toFixed(digits);
    } else {
      text = Math.abs(x).toFixed(digits);
    }
    return (x < 0 || Object.is(x, -0)) ? "-" + text : text;
  }
  function grouped(text) {
    var parts = text.split(".");
    parts[0] = parts[0].replace(/\B(?=(\d{3})+(?!\d))/g, ",");
    return parts.join(".");
  }
  function percent(value) { return fixed(100 * value, 0); }
  function priceText(value) { return grouped(fixed(value, value < 100 ? 2 : 0)); }
  function upperFirst(text) { return text ? text.charAt(0).toUpperCase() + text.slice(1) : text; }

  /* Python's format(x, "g"): six significant digits, exponent form below 1e-4 and from 1e6 */
  function general(value) {
    var x = Number(value);
    if (x === 0) { return Object.is(x, -0) ? "-0" : "0"; }
    var parts = x.toExponential(5).split("e");
    var exponent = Number(parts[1]);
    var trim = function (text) { return text.indexOf(".") < 0 ? text : text.replace(/0+$/, "").replace(/\.$/, ""); };
    if (exponent < -4 || exponent >= 6) {
      return trim(parts[0]) + "e" + (exponent < 0 ? "-" : "+") + String(Math.abs(exponent)).padStart(2, "0");
    }
    return trim(x.toFixed(Math.max(0, 5 - exponent)));
  }

  function rangeText(value) {
    return Array.isArray(value) ? general(value[0]) + " to " + general(value[1]) : general(value);
  }

  function scenarioLine(s) {
    var text = upperFirst(s.role) + " at pH " + rangeText(s.ph) + ", " + rangeText(s.potential) + " V vs " + s.scale +
      ", " + general(s.temperature) + " \u00B0C, dissolved species at activity " + general(s.activity) + "; acceptable: " +
      s.accept.join(", ");
    if (s.family) { text += "; family " + s.family; }
    if (s.materials) { text += "; " + s.materials.length + " chosen materials"; }
    return text + ".";
  }

  function hazardCell(hazards) {
    var cell = el("td", "hazard-cell");
    if (!hazards.length) { cell.appendChild(el("span", "none", "none flagged")); return cell; }
    var list = el("ul", "hazards");
    hazards.forEach(function (h) {
      var item = el("li", "hazard hazard-" + h.kind);
      if (h.kind === "toxic") {
        item.appendChild(el("strong", null, "Toxic:"));
        item.appendChild(document.createTextNode(" " + h.species + " can form here: " + h.note));
      } else {
        item.appendChild(el("strong", null, "Gas:"));
        item.appendChild(document.createTextNode(" " + (GAS_WORDS[h.species] || h.species + " evolves")));
      }
      list.appendChild(item);
    });
    cell.appendChild(list);
    return cell;
  }

  function verdictNode(value) {
    var node = el("span", "verdict verdict-" + value.replace(/ /g, "-"));
    var mark = el("span", null, MARKS[value] || "");
    mark.setAttribute("aria-hidden", "true");
    node.appendChild(mark);
    node.appendChild(document.createTextNode(" " + value));
    return node;
  }

  function rowNode(row, ticked, scenario) {
    var tr = el("tr");
    tr.dataset.material = row.material;
    var pick = el("td");
    var label = el("label", "inline");
    var box = el("input");
    box.type = "checkbox"; box.name = "compare"; box.value = row.material;
    box.setAttribute("form", "scenario-form");
    box.checked = ticked;
    label.appendChild(box);
    label.appendChild(el("span", "visually-hidden", "compare " + row.name));
    pick.appendChild(label);
    tr.appendChild(pick);
    tr.appendChild(el("td", "num", String(row.rank)));
    var name = el("th");
    name.scope = "row";
    var link = el("a", null, row.name);
    link.href = form.dataset.materials + "/" + encodeURIComponent(row.material) + "?" +
      new URLSearchParams({ activity: general(scenario.activity), temperature: general(scenario.temperature) }).toString();
    name.appendChild(link);
    name.appendChild(document.createTextNode(" "));
    name.appendChild(el("span", "id", row.material));
    tr.appendChild(name);
    var verdict = el("td");
    verdict.appendChild(verdictNode(row.verdict));
    tr.appendChild(verdict);
    tr.appendChild(el("td", "num", percent(row.fractions.immunity)));
    tr.appendChild(el("td", "num", percent(row.fractions.passivation)));
    tr.appendChild(el("td", "num", percent(row.fractions.corrosion)));
    tr.appendChild(el("td", "num", fixed(row.instability_ev, 2)));
    tr.appendChild(el("td", "num", fixed(row.log10_dissolved, 1)));
    tr.appendChild(el("td", "num", fixed(row.margin_mv, 0) + (row.margin_capped && row.margin_mv > 0 ? "+" : "")));
    tr.appendChild(hazardCell(row.hazards));
    var price = row.price_usd_per_kg === null ? "unknown" : priceText(row.price_usd_per_kg) +
      (row.price_year ? " (" + row.price_year + ")" : "");
    tr.appendChild(el("td", "num", price));
    tr.appendChild(el("td", "reason", row.reason));
    return tr;
  }

  function renderNotes(rows) {
    var kept = {};
    notesBox.querySelectorAll("textarea").forEach(function (area) { kept[area.name] = area.value; });
    notesBox.textContent = "";
    rows.forEach(function (row) {
      var wrap = el("div", "note-field");
      wrap.dataset.material = row.material;
      var id = "note-" + row.material;
      var label = el("label", null, "Note on " + row.name);
      label.htmlFor = id;
      var area = el("textarea");
      area.id = id; area.name = "note_" + row.material; area.maxLength = 2000; area.rows = 2;
      area.value = kept[area.name] || "";
      wrap.appendChild(label);
      wrap.appendChild(area);
      notesBox.appendChild(wrap);
    });
  }

  function render(result) {
    lastResult = result;
    var before = {};
    tbody.querySelectorAll("input[name=compare]").forEach(function (box) { before[box.value] = box.checked; });
    var keepTicks = result.results.some(function (row) { return before[row.material]; });
    tbody.textContent = "";
    result.results.forEach(function (row, index) {
      var ticked = keepTicks ? Boolean(before[row.material]) : index < 3;
      tbody.appendChild(rowNode(row, ticked, result.scenario));
    });
    document.getElementById("rule-text").textContent = result.rule;
    document.getElementById("scenario-line").textContent = scenarioLine(result.scenario);
    document.getElementById("row-count").textContent = String(result.results.length);
    var conditions = document.getElementById("conditions-text");
    conditions.textContent = result.conditions ? result.conditions +
      (typeof result.neutral_ph === "number" ? " Neutral pH " + result.neutral_ph.toFixed(2) + "." : "") : "";
    var notesBlock = document.getElementById("temperature-notes");
    var notesList = document.getElementById("temperature-notes-list");
    notesList.textContent = "";
    var perElement = result.temperature_notes || {};
    Object.keys(perElement).forEach(function (element) {
      perElement[element].forEach(function (line) {
        var item = el("li");
        item.appendChild(el("strong", null, element));
        item.appendChild(document.createTextNode(" " + line));
        notesList.appendChild(item);
      });
    });
    notesBlock.hidden = notesList.children.length === 0;
    var gas = document.getElementById("gas-notes");
    var seen = {};
    gas.textContent = "";
    result.results.forEach(function (row) {
      row.hazards.forEach(function (h) {
        if (h.kind !== "gas" || seen[h.note]) { return; }
        seen[h.note] = true;
        var item = el("li");
        item.appendChild(el("strong", null, "Gas:"));
        item.appendChild(document.createTextNode(" " + upperFirst(h.note) + "."));
        gas.appendChild(item);
      });
    });
    renderNotes(result.results);
  }

  function showErrors(problems) {
    form.querySelectorAll("[aria-invalid]").forEach(function (input) { input.removeAttribute("aria-invalid"); });
    errorList.textContent = "";
    problems.forEach(function (problem) {
      var item = el("li", null, problem.msg);
      item.dataset.field = problem.field;
      errorList.appendChild(item);
      var input = form.querySelector("[name='" + problem.field + "']");
      if (input) { input.setAttribute("aria-invalid", "true"); }
    });
    errorsBox.hidden = problems.length === 0;
  }

  function problemsFrom(detail) {
    if (!Array.isArray(detail)) { return [{ field: "", msg: String(detail) }]; }
    return detail.map(function (item) {
      var loc = (item.loc || []).filter(function (part) { return part !== "body"; });
      var field = String(loc[0] === undefined ? "" : loc[0]);
      return { field: BODY_TO_FIELD[field] || field, msg: item.msg };
    });
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
    var params = viewParams();
    var query = params.toString();
    updateLinks(query);
    var local = localProblems(params);
    if (local.length) { showErrors(local); return Promise.resolve(); }
    var mine = ++sequence;
    body.dataset.busy = "1";
    statusLine.textContent = "Screening\u2026";
    return fetch(form.dataset.apiScreen, {
      method: "POST", headers: { "Content-Type": "application/json", "Accept": "application/json" },
      body: JSON.stringify(scenarioBody(params))
    }).then(function (response) {
      return response.json().then(function (data) { return { ok: response.ok, data: data }; });
    }).then(function (answer) {
      if (mine !== sequence) { return; }
      if (answer.ok) {
        showErrors([]);
        render(answer.data);
        statusLine.textContent = "Ranked " + answer.data.results.length + " candidates.";
      } else {
        showErrors(problemsFrom(answer.data.detail));
        statusLine.textContent = "Not ranked: see the messages above.";
      }
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
    var params = viewParams();
    var notes = {};
    notesBox.querySelectorAll("textarea").forEach(function (area) {
      if (area.value.trim()) { notes[area.name.replace(/^note_/, "")] = area.value; }
    });
    var title = document.getElementById("title").value;
    saveStatus.textContent = "Saving\u2026";
    fetch(form.dataset.apiShortlists, {
      method: "POST", headers: { "Content-Type": "application/json", "Accept": "application/json" },
      body: JSON.stringify({ title: title, scenario: scenarioBody(params), notes: notes })
    }).then(function (response) {
      return response.json().then(function (data) { return { ok: response.ok, data: data }; });
    }).then(function (answer) {
      saveStatus.textContent = "";
      if (!answer.ok) {
        saveStatus.textContent = "Not saved: " + problemsFrom(answer.data.detail).map(function (p) { return p.msg; }).join("; ");
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
