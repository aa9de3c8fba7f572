// Formwise explorer: builds a /v1/designs request from the form, shows the ranked designs and
// asks the chart endpoints for the pictures. Plain browser JavaScript, no library.
"use strict";

(function () {
  const form = document.getElementById("request-form");
  const status = document.getElementById("status");
  const submit = document.getElementById("submit");
  const formErrors = document.getElementById("form-errors");
  const tableBody = document.querySelector("#designs tbody");
  const headers = Array.from(document.querySelectorAll("#designs th"));
  const imageUrls = {};
  let designs = [];
  let sortKey = "rank";
  let sortDescending = false;
  let lastBody = null;

  // ---------------------------------------------------------------- the request

  function fieldValue(input) {
    const kind = input.dataset.kind;
    if (kind === "boolean") return input.checked;
    const text = input.value.trim();
    if (text === "") return undefined;
    if (kind === "integer" && /^[0-9]+$/.test(text)) return Number(text);
    // A plain number is sent as a number (SI); anything else as text with its unit.
    if (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(text)) return Number(text);
    return text;
  }

  function setPath(target, path, value) {
    const parts = path.split(".");
    let node = target;
    for (const part of parts.slice(0, -1)) {
      node[part] = node[part] || {};
      node = node[part];
    }
    node[parts[parts.length - 1]] = value;
  }

  function isTorsion() {
    return document.getElementById("load_case.type").value === "torsion";
  }

  function buildBody() {
    const body = {};
    for (const input of form.querySelectorAll("[data-path]")) {
      const wrapper = input.closest(".field");
      if (wrapper && wrapper.hidden) continue;
      const value = fieldValue(input);
      if (value !== undefined) setPath(body, input.dataset.path, value);
    }
    return body;
  }

  function showLoadFields() {
    const torsion = isTorsion();
    for (const field of form.querySelectorAll("[data-for]")) {
      field.hidden = (field.dataset.for === "torsion") !== torsion;
    }
  }

  // ---------------------------------------------------------------- errors by field

  function clearErrors() {
    for (const node of form.querySelectorAll(".field-error")) node.remove();
    for (const input of form.querySelectorAll("[aria-invalid]")) {
      input.removeAttribute("aria-invalid");
      input.removeAttribute("aria-describedby");
    }
    formErrors.hidden = true;
    formErrors.textContent = "";
  }

  function inputForPath(path) {
    // The deepest form field whose path starts the error's path ("load_case.span" for
    // "load_case.span", "requirements" for a schema-level message on requirements).
    let best = null;
    for (const input of form.querySelectorAll("[data-path]")) {
      const own = input.dataset.path;
      if ((path === own || path.startsWith(own + ".")) &&
          (!best || own.length > best.dataset.path.length)) best = input;
    }
    return best;
  }

  function showProblem(problem, prefix) {
    const errors = (problem && problem.errors) || {};
    const loose = [];
    for (const [rawPath, messages] of Object.entries(errors)) {
      const path = prefix && rawPath.startsWith(prefix) ? rawPath.slice(prefix.length) : rawPath;
      const input = inputForPath(path);
      if (!input || input.closest(".field").hidden) {
        loose.push(rawPath + ": " + messages.join(" "));
        continue;
      }
      const note = document.createElement("p");
      note.className = "field-error";
      note.id = "error-" + input.id;
      note.textContent = messages.join(" ");
      input.closest(".field").appendChild(note);
      input.setAttribute("aria-invalid", "true");
      input.setAttribute("aria-describedby", note.id);
    }
    if (!Object.keys(errors).length) {
      loose.push((problem && (problem.detail || problem.title)) || "The request failed.");
    }
    if (loose.length) {
      formErrors.hidden = false;
      formErrors.textContent = loose.join("\n");
    }
    const first = form.querySelector("[aria-invalid='true']");
    if (first) first.focus();
  }

  // ---------------------------------------------------------------- talking to the API

  async function postJson(path, body) {
    const response = await fetch(path, {
      method: "POST",
      headers: {"Content-Type": "application/json", "Accept": "application/json"},
      body: JSON.stringify(body),
    });
    const data = await response.json();
    return {ok: response.ok, data};
  }

  async function showImage(kind, path, body, alt) {
    const figure = document.getElementById(kind + "-figure");
    const image = document.getElementById(kind + "-image");
    const response = await fetch(path, {
      method: "POST",
      headers: {"Content-Type": "application/json", "Accept": "image/svg+xml"},
      body: JSON.stringify(body),
    });
    if (!response.ok) {
      const problem = await response.json();
      figure.hidden = false;
      image.removeAttribute("src");
      image.alt = "";
      figure.querySelector("figcaption").textContent =
        "No picture: " + (problem.detail || problem.title) + " " +
        Object.entries(problem.errors || {}).map(([p, m]) => p + ": " + m.join(" ")).join("; ");
      return;
    }
    const blob = await response.blob();
    if (imageUrls[kind]) URL.revokeObjectURL(imageUrls[kind]);
    imageUrls[kind] = URL.createObjectURL(blob);
    image.dataset.loaded = "false";
    image.src = imageUrls[kind];
    image.alt = alt;
    figure.hidden = false;
  }

  // ---------------------------------------------------------------- the designs table

  const format = (value, digits) =>
    value === null || value === undefined ? "–" : Number(value).toPrecision(digits);
  const percent = (value) =>
    value === null || value === undefined ? "–" : Math.round(value * 100) + "%";
  const millimetres = (metres) => {
    const mm = metres * 1000;
    return (mm < 100 ? mm.toFixed(2) : mm.toFixed(1)).replace(/\.?0+$/, "");
  };
  const familyWords = {
    solid_round: "solid round", solid_rectangle: "solid rectangle", round_tube: "round tube",
    rectangular_tube: "box tube", i_section: "I-section", sandwich_panel: "sandwich panel",
  };

  function sortValue(design, key) {
    switch (key) {
      case "material": return design.material.name;
      case "section": return design.section.family;
      case "stiffness": case "strength": case "local_buckling":
        return design.utilization[key] === null ? -1 : design.utilization[key];
      default: return design[key];
    }
  }

  function sortedDesigns() {
    const copy = designs.slice();
    copy.sort((a, b) => {
      const x = sortValue(a, sortKey);
      const y = sortValue(b, sortKey);
      const order = typeof x === "string" ? x.localeCompare(y) : x - y;
      return sortDescending ? -order : order;
    });
    return copy;
  }

  // Dimension names of each family in the contract's order (JSON objects lose it).
  const dimensionOrder = {};

  function sectionText(section) {
    const names = dimensionOrder[section.family] || Object.keys(section.dimensions);
    const dims = names.map((name) => millimetres(section.dimensions[name])).join(" × ");
    return (familyWords[section.family] || section.family) + " " + dims + " mm";
  }

  function renderTable(selectedRank) {
    tableBody.textContent = "";
    for (const design of sortedDesigns()) {
      const row = document.createElement("tr");
      row.tabIndex = 0;
      row.dataset.rank = design.rank;
      row.setAttribute("aria-selected", String(design.rank === selectedRank));
      const cells = [
        [String(design.rank), "num"],
        [design.material.name, "wrap"],
        [sectionText(design.section), "wrap"],
        [format(design.mass, 3), "num"],
        [format(design.cost, 3), "num"],
        [format(design.carbon, 3), "num"],
        [design.governing.replace("_", " "), "governing"],
      ];
      for (const [text, cls] of cells) {
        const cell = document.createElement("td");
        cell.textContent = text;
        if (cls) cell.className = cls;
        row.appendChild(cell);
      }
      for (const key of ["stiffness", "strength", "local_buckling"]) {
        const cell = document.createElement("td");
        cell.className = "num";
        const value = design.utilization[key];
        const span = document.createElement("span");
        span.className = "util" + (value !== null && value > 0.95 ? " high" : "");
        span.textContent = percent(value);
        cell.appendChild(span);
        row.appendChild(cell);
      }
      row.addEventListener("click", () => selectDesign(design.rank));
      row.addEventListener("keydown", (event) => {
        if (event.key === "Enter" || event.key === " ") {
          event.preventDefault();
          selectDesign(design.rank);
        }
      });
      tableBody.appendChild(row);
    }
  }

  function sortBy(key) {
    if (sortKey === key) sortDescending = !sortDescending;
    else { sortKey = key; sortDescending = false; }
    for (const header of headers) {
      if (header.dataset.key === sortKey) {
        header.setAttribute("aria-sort", sortDescending ? "descending" : "ascending");
      } else header.removeAttribute("aria-sort");
    }
    const selected = tableBody.querySelector("tr[aria-selected='true']");
    renderTable(selected ? Number(selected.dataset.rank) : null);
  }

  function selectDesign(rank) {
    const design = designs.find((d) => d.rank === rank);
    if (!design) return;
    for (const row of tableBody.rows) {
      row.setAttribute("aria-selected", String(Number(row.dataset.rank) === rank));
    }
    document.getElementById("section-caption").textContent =
      "Section of design " + rank + ": " + design.material.name + ", to scale.";
    showDetails(design);
    showImage("section", "/v1/charts/section", {
      family: design.section.family,
      dimensions: design.section.dimensions,
      caption: "#" + rank + " " + design.material.name,
      property_basis: lastBody.property_basis,
    }, "Section drawing of design " + rank + ": " + sectionText(design.section) + ", " +
       design.material.name);
  }

  function showDetails(design) {
    const list = document.getElementById("selected-details");
    list.textContent = "";
    const u = design.utilization;
    const entries = [
      ["Material", design.material.name],
      ["Section", sectionText(design.section)],
      ["Core", design.core_material ? design.core_material.name : null],
      ["Mass", format(design.mass, 3) + " kg"],
      ["Cost", format(design.cost, 3)],
      ["Embodied carbon", format(design.carbon, 3) + " kg CO₂e"],
      ["Deflection", design.deflection === null ? null
        : format(design.deflection * 1000, 3) + " mm"],
      ["Twist", design.twist === null ? null : format(design.twist, 3) + " rad"],
      ["Peak stress", format(design.max_stress / 1e6, 3) + " MPa"],
      ["Governed by", design.governing.replace("_", " ")],
      ["Utilization", Object.entries(u).filter(([, v]) => v !== null)
        .map(([k, v]) => k.replace("_", " ") + " " + percent(v)).join(", ")],
    ];
    for (const [term, value] of entries) {
      if (value === null) continue;
      const dt = document.createElement("dt");
      dt.textContent = term;
      const dd = document.createElement("dd");
      dd.textContent = value;
      list.append(dt, dd);
    }
    document.getElementById("selected-title").textContent = "Design " + design.rank;
    document.getElementById("selected").hidden = false;
  }

  // ---------------------------------------------------------------- curl

  function showCurl(body) {
    const origin = window.location.origin;
    const json = JSON.stringify(body, null, 2).replace(/'/g, "'\\''");
    const text = "curl -s -X POST " + origin + "/v1/designs \\\n" +
      "  -H 'Content-Type: application/json' \\\n  -d '" + json + "'";
    document.getElementById("curl-text").textContent = text;
    const link = document.getElementById("curl-link");
    link.href = "data:text/x-shellscript;charset=utf-8," +
      encodeURIComponent("#!/bin/sh\n" + text + "\n");
    document.getElementById("curl").hidden = false;
  }

  // ---------------------------------------------------------------- submit

  function matchingIndex(body) {
    const torsion = body.load_case.type === "torsion";
    const requirements = body.requirements || {};
    const stiff = torsion ? requirements.max_twist !== undefined
      : requirements.max_deflection !== undefined;
    return {
      loading: torsion ? "torsion" : "bending",
      limit: stiff ? "stiffness" : "strength",
      objective: body.objective || "mass",
    };
  }

  async function onSubmit(event) {
    event.preventDefault();
    clearErrors();
    const body = buildBody();
    lastBody = body;
    submit.disabled = true;
    status.textContent = "Sizing…";
    try {
      const answer = await postJson("/v1/designs", body);
      if (!answer.ok) {
        status.textContent = "The request has problems; see the fields marked.";
        showProblem(answer.data, "");
        return;
      }
      designs = answer.data.designs;
      sortKey = "rank";
      sortDescending = false;
      document.getElementById("empty").hidden = designs.length > 0;
      document.getElementById("empty").textContent = "No feasible design.";
      document.getElementById("designs-wrap").hidden = designs.length === 0;
      // The answer groups its rejections by reason (each with its count of pairs).
      const rejectedPairs = answer.data.rejected.reduce((sum, group) => sum + group.count, 0);
      document.getElementById("rejected").textContent = rejectedPairs
        ? rejectedPairs + " material and section pairs could not meet the requirements, for " +
          answer.data.rejected.length + " reasons (the JSON answer lists them)." : "";
      document.getElementById("full-caution").textContent = answer.data.caution;
      renderTable(designs.length ? 1 : null);
      showCurl(body);
      status.textContent = designs.length + " designs.";
      if (!designs.length) return;
      selectDesign(1);
      const versus = document.getElementById("versus").value;
      const index = matchingIndex(body);
      const ids = Array.from(new Set(designs.map((d) => d.material.id)));
      await Promise.all([
        showImage("tradeoff", "/v1/charts/designs", {request: body, versus: versus},
          "Trade-off chart of the designs: mass against " + versus +
          ", with the Pareto front"),
        showImage("property", "/v1/charts/properties", {
          guide: index, highlight: {ids: ids},
          property_basis: body.property_basis || "typical",
        }, "Material property chart for the " + index.loading + " " + index.limit +
           " index; the designs' materials highlighted"),
      ]);
    } catch (error) {
      status.textContent = "The service did not answer: " + error.message;
    } finally {
      submit.disabled = false;
    }
  }

  // ---------------------------------------------------------------- wiring

  async function loadFamilies() {
    const response = await fetch("/v1/sections", {headers: {"Accept": "application/json"}});
    const data = await response.json();
    for (const family of data.families) {
      dimensionOrder[family.id] = family.dimensions.map((d) => d.name);
    }
  }

  async function followSchema() {
    // The choices of property_basis (and its default) come from the service's own document.
    try {
      const response = await fetch("/v1/openapi.json", {headers: {"Accept": "application/json"}});
      const spec = await response.json();
      const field = spec.components.schemas.DesignRequest.properties.property_basis;
      const select = document.getElementById("property_basis");
      select.textContent = "";
      for (const value of field.enum) {
        const option = document.createElement("option");
        option.value = value;
        option.textContent = value;
        option.selected = value === field.default;
        select.appendChild(option);
      }
    } catch (error) {
      status.textContent = "Could not read the API document; the built-in choices stay.";
    }
  }

  form.addEventListener("submit", onSubmit);
  for (const image of document.querySelectorAll("figure img")) {
    // Marks a drawn picture (tests and assistive tools can tell it has arrived).
    image.addEventListener("load", () => { image.dataset.loaded = "true"; });
  }
  document.getElementById("load_case.type").addEventListener("change", showLoadFields);
  for (const header of headers) {
    header.querySelector("button").addEventListener("click", () => sortBy(header.dataset.key));
  }
  showLoadFields();
  followSchema();
  loadFamilies().catch(() => { /* dimensions then keep the answer's order */ });
})();
