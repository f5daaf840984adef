// The page: loads the index into the worker, checks the list as you type,
// shows findings, pictures and exports. Plain DOM, no framework.

import { initDraft, readingSentence } from "./draft.js";
import { cleanedRows, toJsonReport, download } from "./outputs.js";
import { ensureDefs, stripSvg, stripWords, coverageRow, esc } from "./pictures.js";
import { encodeState, decodeState } from "./permalink.js";
import { setupCompare } from "./compare.js";
import { open, readManifest } from "./rollcall.js";
import { embedded } from "./embedded.js";
import { initSearch } from "./search.js";
import { rowsHtml, wireFindings, focusRow, resetTabStop } from "./findings.js";
import { renderGlossary } from "./glossary.js";
import { EditHistory } from "./undo.js";
import { renderChanges } from "./changes.js";
import { pageWords, titleOf, creditOf, siteCreditOf } from "./wording.js";
import { initCard } from "./card.js";

const $ = (id) => document.getElementById(id);
const ROW_PAGE = 500;
const STRIP_LIMIT = 150;
const LINK_LIMIT = 60_000; // characters of fragment; longer lists get no link
// A site's own indexes (site-indexes.json beside the page) are picked by
// this prefix and their name there, so a link keeps the pick.
const SITE = "site:";
const siteIndexes = new Map(); // picker value -> {name, manifest}

// --------------------------------------------------------------- checker --

// The checker and its worker come from the module API (rollcall.js); this
// page is one of its users. `embedded` is null here; the single-file build
// puts the index, Wasm and worker into it.
let checker = null;

function ask(type, payload, onPage = null) {
  if (!checker) return Promise.reject(new Error("the index is not loaded"));
  return checker.request(type, payload, [], onPage);
}

// ---------------------------------------------------------------- state --

const state = {
  info: null,
  report: null,
  coverage: [],
  rows: [], // findings rows after filtering
  shown: ROW_PAGE,
  seq: 0,
  timer: 0,
  shapes: null, // a shape-only system picked in the menu, or null
  indexKey: null, // the menu's value for the loaded index (a system name, or SITE + a site index's name)
  site: null, // the loaded index's entry when it is one of the site's own
  linkSystem: "", // the system a restored link asked for (a site index is in the menu only once the site's list is read)
  loaded: [], // the systems whose indexes the worker has loaded
  original: null, // the list as pasted (read from a file, a link, the demo), for the changes view
  pageText: null, // what the page last wrote into the list (its undo keys apply while the list still holds it)
  focusAfter: null, // after a fix: {index, key} of the finding to focus once the check is shown
  workbook: null, // { name, bytes } while a dropped workbook is the list
  // The systems with a bundled index, by name ({name, title, manifest, ...}),
  // as the core says through the binding once the first index is in; the
  // others in the "Code system" menu are checked by shape and check digit.
  bundled: null,
};
const edits = new EditHistory();

// ----------------------------------------------------------- index load --

function showIndexError(text) {
  $("index-loading").hidden = true;
  const box = $("index-error");
  box.hidden = false;
  box.innerHTML = `<strong><span aria-hidden="true">✖</span> The index cannot be used.</strong> ${esc(text)}`;
  document.body.dataset.state = "index-error";
}

function formatBytes(n) {
  if (n >= 1e6) return `${(n / 1e6).toFixed(1)} MB`;
  if (n >= 1e3) return `${(n / 1e3).toFixed(0)} kB`;
  return `${n} bytes`;
}

function indexFileName(manifest) {
  const asked = new URLSearchParams(location.search).get("index");
  if (asked !== null) {
    if (!/^[A-Za-z0-9][A-Za-z0-9._-]*\.rcx$/.test(asked)) {
      throw new Error(`“${asked}” is not an index file name this page will load (expected a name like icd10cm.rcx)`);
    }
    return asked;
  }
  return manifest.file || "icd10cm.rcx";
}

function showProgress(got, total) {
  if (total) $("index-progress").value = Math.min(got / total, 1);
  $("index-progress-text").textContent = total ? `${formatBytes(got)} of ${formatBytes(total)}` : formatBytes(got);
}

/** The manifest beside the page of a system's bundled index (the core's name for it). */
function manifestOf(name) {
  const system = state.bundled && state.bundled.get(name);
  if (!system) throw new Error("the index is not loaded");
  return system.manifest;
}

/** Opens the index of another system (fetched the first time it is asked for). */
async function switchSystem(name) {
  const box = $("options-error");
  const site = siteIndexes.get(name) || null;
  if (state.bundled && !state.bundled.has(name) && !site) {
    // No content to load: the loaded index stays for rows naming its system.
    state.shapes = name;
    box.hidden = true;
    showSystem();
    runCheck();
    return;
  }
  const wasShapes = state.shapes;
  state.shapes = null;
  if (state.info && state.indexKey === name) {
    if (wasShapes) {
      showSystem();
      runCheck();
    }
    return;
  }
  const title = site ? site.manifest.title : titleOf(name);
  $("check-status").textContent = `Loading the ${title} index…`;
  document.body.dataset.state = "loading";
  try {
    // A site index's manifest was read (and checked) with the site's list.
    const manifest = site
      ? site.manifest
      : await readManifest(manifestOf(name));
    const opened = await open(manifest.file, { manifest, onProgress: showProgress });
    if (checker) checker.close();
    checker = opened;
    state.indexKey = name;
    state.site = site;
    box.hidden = true;
    showIndexReady(opened.info);
    runCheck();
  } catch (e) {
    box.hidden = false;
    box.textContent = `Could not load the ${title} index: ${e.message.replace(/^Error: /, "")}`;
    $("opt-system").value = wasShapes || state.indexKey || "icd10cm";
    state.shapes = wasShapes;
    showSystem();
    document.body.dataset.state = state.info ? "ready" : "index-error";
    $("check-status").textContent = "";
  }
}

async function loadIndex() {
  let opened;
  try {
    if (embedded) {
      opened = await open(await embedded.index(), {
        manifest: embedded.manifest,
        worker: embedded.worker(),
        wasm: await embedded.wasm(),
        notes: embedded.notes,
      });
    } else {
      // The manifest is read first: it names the index file.
      const manifest = await readManifest("index-manifest.json");
      opened = await open(indexFileName(manifest), { manifest, onProgress: showProgress });
    }
    const systems = await opened.request("bundled");
    state.bundled = new Map(systems.map((s) => [s.name, s]));
  } catch (e) {
    if (opened) opened.close();
    const msg = e.message.replace(/^Error: /, "");
    throw new Error(`${msg.charAt(0).toUpperCase()}${msg.slice(1)}`);
  }
  checker = opened;
  return opened.info;
}

function showIndexReady(info) {
  state.info = info;
  $("index-loading").hidden = true;
  for (const id of ["opt-on", "opt-from", "opt-to"]) {
    $(id).min = info.coverage_from;
    $(id).max = info.coverage_to;
  }
  showSystem();
  $("check-now").disabled = false;
  document.body.dataset.state = "ready";
  performance.mark("rollcall-ready");
}

/** The index line, the day hint and the footer's credits, for the system picked. */
function showSystem() {
  const info = state.info;
  if (!info) return;
  const p = $("index-ready");
  p.hidden = false;
  const indexWords =
    `${esc(info.title)} index${state.site ? " (this site's own)" : ""}, release <strong id="index-release">${esc(info.release)}</strong>, ` +
    (info.coverage_from === info.coverage_to
      ? `one release only: terms are checked as of it, and study dates do not apply to them `
      : `covers <strong>${esc(info.coverage_from)}</strong> to <strong>${esc(info.coverage_to)}</strong> `) +
    `<span class="hint">(${formatBytes(info.byte_length)}, SHA-256 ${esc(info.sha256.slice(0, 12))}…, matches its manifest)</span>`;
  p.innerHTML = state.shapes
    ? `<span aria-hidden="true">✓</span> <strong>${esc(titleOf(state.shapes))}</strong>: checked by shape and check digit only (rollcall holds none of its content). ` +
      `<span class="hint">Rows whose system column names ${esc(info.title)} are checked against its ${indexWords.replace(/ id="index-release"/, "")}</span>`
    : `<span aria-hidden="true">✓</span> ${indexWords}`;
  p.dataset.system = state.shapes || state.indexKey || info.vocabulary;
  const today = new Date().toISOString().slice(0, 10);
  const day = info.default_day || today;
  $("on-hint").textContent = state.shapes
    ? `Empty means today (${today}, UTC).`
    : info.coverage_from === info.coverage_to
      ? `${info.title} is one release (${info.release}): the day and period do not change its check.`
      : day !== today
        ? `Empty means ${day}, not today: the ${info.title} index covers ${info.coverage_from} to ${info.coverage_to}, and a day outside it would make every code read as retired or not yet valid.`
        : `Empty means today (${today}, UTC). The index covers ${info.coverage_from} to ${info.coverage_to}.`;
  $("on-hint").dataset.defaultDay = state.shapes ? today : day;
  $("source-credit").textContent =
    state.site && !state.shapes ? siteCreditOf(info.title) : creditOf(state.shapes || info.vocabulary);
  // The credit the release's licence asks for (HPO), shown while its index is in use.
  const notice = $("index-notice");
  notice.textContent = info.notice || "";
  notice.hidden = !info.notice;
  $("source-files").textContent =
    !state.shapes && info.sources.length ? `Built from: ${info.sources.map((s) => `${s.file} (${s.role})`).join("; ")}.` : "";
}

// ---------------------------------------------------- the site's indexes --

/** The menu's words for a site index: its title, release and coverage. */
function siteLabel(m) {
  const covers = m.coverage_from === m.coverage_to ? "one release" : `covers ${m.coverage_from} to ${m.coverage_to}`;
  return `${m.title}, release ${m.release} (${covers})`;
}

/**
 * Offer the indexes the site lists in site-indexes.json in the "Code system"
 * menu (the worker reads the file and each manifest, by the binding's
 * rules). None listed, or no such file: the menu stays as built. A file or
 * manifest that cannot be used is named above the menu.
 */
async function loadSiteIndexes() {
  // The single-file page has no folder to hold them.
  if (embedded) return;
  const box = $("site-indexes-message");
  let site;
  try {
    site = await ask("site");
  } catch (e) {
    box.hidden = false;
    box.textContent = `This site's own indexes are not offered: ${e.message.replace(/^Error: /, "")}.`;
    document.body.dataset.siteIndexes = "error";
    return;
  }
  const pick = $("opt-system");
  if (site.indexes.length) {
    const group = document.createElement("optgroup");
    group.label = "This site's own indexes";
    group.id = "site-indexes";
    for (const s of site.indexes) {
      siteIndexes.set(SITE + s.name, s);
      const o = document.createElement("option");
      o.value = SITE + s.name;
      o.textContent = siteLabel(s.manifest);
      group.append(o);
    }
    // Before the shape-only systems: these hold content, as the bundled ones do.
    pick.insertBefore(group, pick.querySelector("optgroup"));
  }
  box.hidden = !site.problems.length;
  box.textContent = site.problems.length
    ? `Not offered from this site's own indexes: ${site.problems.map((p) => p.message).join("; ")}.`
    : "";
  document.body.dataset.siteIndexes = String(site.indexes.length);
  // A link made with a site index picked: pick it again, or say why not.
  const asked = state.linkSystem;
  if (asked.startsWith(SITE)) {
    if (siteIndexes.has(asked)) pick.value = asked;
    else {
      $("link-status").textContent =
        `This link was checked against this site's index “${asked.slice(SITE.length)}”, which the site no longer offers; pick another under Code system.`;
    }
  }
}

// --------------------------------------------------------------- options --

function readOptions() {
  const mode = $("when-period").checked ? "period" : "on";
  return {
    mode,
    on: $("opt-on").value,
    from: $("opt-from").value,
    to: $("opt-to").value,
    billable: $("opt-billable").checked,
    system: $("opt-system").value,
  };
}

function checkerOptions(o) {
  const reading = draft ? draft.reading() : undefined;
  const read = reading ? { reading } : {};
  if (o.mode === "period") return { from: o.from || null, to: o.to || null, billable: o.billable, ...read };
  return { on: o.on || null, billable: o.billable, ...read };
}

/** The draft controls (reading, marks), once wired. */
let draft = null;
/** The code card, once wired. */
let card = null;

function writeOptions(o) {
  $("when-period").checked = o.mode === "period";
  $("when-on").checked = o.mode !== "period";
  $("opt-on").value = o.on || "";
  $("opt-from").value = o.from || "";
  $("opt-to").value = o.to || "";
  $("opt-billable").checked = !!o.billable;
  syncModeFields();
  // A link made with another system picked: pick it again (checkPicked
  // then fetches its index, once the page's first index is in).
  const pick = $("opt-system");
  if (o.system && [...pick.options].some((x) => x.value === o.system)) pick.value = o.system;
}

/** Check the list in the system the menu shows, switching to it first when needed. */
function checkPicked() {
  const want = $("opt-system").value;
  const now = state.shapes || state.indexKey || "icd10cm";
  if (want !== now) switchSystem(want);
  else runCheck();
}

/**
 * Whether the options are still being typed: a study period with one end
 * missing, or (while focus is in its fields) ending before it starts. The
 * check then waits, with a hint and no error, until both ends are given.
 */
function periodPending(o) {
  if (o.mode !== "period") return false;
  if (!o.from || !o.to) return true;
  const typing = ["opt-from", "opt-to"].includes(document.activeElement && document.activeElement.id);
  return typing && o.from > o.to;
}

function syncModeFields() {
  const period = $("when-period").checked;
  $("on-fields").hidden = period;
  $("period-fields").hidden = !period;
}

// ---------------------------------------------------------------- check --

function scheduleCheck() {
  clearTimeout(state.timer);
  state.timer = setTimeout(runCheck, 250);
}

async function runCheck() {
  clearTimeout(state.timer);
  if (!state.info) return;
  const text = $("list").value;
  const opts = readOptions();
  syncDemo();
  if (periodPending(opts)) {
    $("options-error").hidden = true;
    $("check-status").textContent = "Waiting for both days of the study period.";
    return;
  }
  const seq = ++state.seq;
  document.body.dataset.checking = "true";
  $("check-status").textContent = "Checking…";
  const pages = { seq, started: performance.now(), shown: 0, rows: [] };
  try {
    // A dropped workbook is checked from its bytes, as the command line
    // reads it; the list area shows its rows until it is edited.
    const result = state.workbook
      ? await ask("checkBytes", { bytes: state.workbook.bytes.slice().buffer, options: checkerOptions(opts) })
      : await ask("check", { text, options: checkerOptions(opts), system: state.shapes || undefined }, (page) => showPage(pages, page));
    if (seq !== state.seq) return; // a newer check is on its way
    settleTable();
    $("options-error").hidden = true;
    state.report = result.report;
    state.coverage = result.coverage;
    state.loaded = result.loaded || [];
    render();
    $("reading-line").textContent = readingSentence(result.report);
    if (!state.workbook) draft.mark(text).catch(() => {});
    const n = result.report.summary.lines;
    $("check-status").textContent = `Checked ${n.toLocaleString("en-US")} line${n === 1 ? "" : "s"} in ${result.checkMs.toFixed(0)} ms.`;
    document.body.dataset.checkMs = String(result.checkMs);
    updateLink(text, opts);
    requestStrips(result.report);
    compareView.listAChanged();
  } catch (e) {
    if (seq !== state.seq) return;
    settleTable();
    if (pages.shown && state.report) render(); // the findings so far were of this check
    const box = $("options-error");
    box.hidden = false;
    box.textContent = `Could not check: ${pageWords(e.message.replace(/^Error: /, "").replace(/^bad check options: /, ""))}`;
    $("check-status").textContent = "";
  } finally {
    if (seq === state.seq) {
      document.body.dataset.checking = "false";
      document.body.dataset.checked = String(seq);
    }
  }
}

// ------------------------------------------------------------- findings --

function findingRows(report) {
  const rows = [];
  for (const e of report.entries) entryRows(e, rows);
  for (const f of report.list_findings) {
    rows.push({ line: f.lines[0] ?? 0, lines: f.lines, input: f.codes.join(", "), entry: null, ...pick(f) });
  }
  return rows.sort(bySeverity);
}

/** The findings rows of one entry, added to `rows`. */
function entryRows(e, rows) {
  for (const f of e.findings) {
    rows.push({ line: e.line, lines: [e.line], input: e.code ?? e.input.trim(), entry: e, ...pick(f) });
  }
}

// Errors first, then warnings, then info; by line within each.
const RANK = { error: 0, warning: 1, info: 2 };
const bySeverity = (a, b) => (RANK[a.severity] ?? 3) - (RANK[b.severity] ?? 3) || a.line - b.line;

// While a long list is checked: how far the check is, and the findings of
// the entries judged so far, at most this often (ms).
const PAGE_SHOW_EVERY = 400;

/** A page of a long list's entries as they are judged (see rollcall.js checkWithCoverage). */
function showPage(pages, page) {
  if (pages.seq !== state.seq) return;
  if (page.restart) {
    pages.rows = [];
    $("check-status").textContent = "Checking again, with the index the list needs…";
    return;
  }
  for (const e of page.entries) entryRows(e, pages.rows);
  const now = performance.now();
  // A short list's reply follows at once: nothing to show before it.
  if (page.done >= page.lines || now - pages.started < 250 || now - pages.shown < PAGE_SHOW_EVERY) return;
  pages.shown = now;
  $("check-status").textContent = `Checking… ${page.done.toLocaleString("en-US")} of ${plural(page.lines, "line")} so far.`;
  renderSoFar(pages.rows);
}

/** The table takes actions again: the check ended (its findings follow), or failed. */
function settleTable() {
  $("findings").tBodies[0].inert = false;
  $("findings").removeAttribute("aria-busy");
}

/**
 * The first findings of the entries judged so far; no action until the
 * check ends. The rows came in line order, so the first of each severity
 * are the first of the table.
 */
function renderSoFar(rows) {
  const first = [];
  for (const sev of ["error", "warning", "info"]) {
    for (const x of rows) {
      if (first.length >= ROW_PAGE) break;
      if (x.severity === sev) first.push(x);
    }
  }
  const body = $("findings").tBodies[0];
  body.inert = true;
  $("findings").setAttribute("aria-busy", "true");
  body.innerHTML = rows.length
    ? rowsHtml(first, (x) => (x.entry && x.entry.system) || "")
    : `<tr><td colspan="6" class="hint">No findings so far.</td></tr>`;
  const more = $("findings-more");
  more.hidden = false;
  more.textContent = `${plural(rows.length, "finding")} so far; the table is complete when the check ends.`;
}

function pick(f) {
  return { kind: f.kind, severity: f.severity, message: f.message, suggestions: f.suggestions || [] };
}

/** What names a finding across a re-check (its line may move; its kind and code stay). */
function rowKey(x) {
  return `${x.kind}\t${x.severity}\t${x.input}`;
}

function plural(n, word, many = `${word}s`) {
  return `${n.toLocaleString("en-US")} ${n === 1 ? word : many}`;
}

function render() {
  const r = state.report;
  const s = r.summary;
  const summary = $("summary");
  summary.dataset.errors = s.errors;
  summary.dataset.warnings = s.warnings;
  summary.dataset.infos = s.infos;
  summary.innerHTML =
    `<span class="sev sev-error"><span aria-hidden="true">✖</span> ${plural(s.errors, "error")}</span> · ` +
    `<span class="sev sev-warning"><span aria-hidden="true">▲</span> ${plural(s.warnings, "warning")}</span> · ` +
    `<span class="sev sev-info"><span aria-hidden="true">●</span> ${s.infos.toLocaleString("en-US")} info</span>` +
    ` <span class="hint">in ${s.entries.toLocaleString("en-US")} code ${s.entries === 1 ? "entry" : "entries"} on ${plural(s.lines, "line")}; ` +
    `checked ${r.options.from === r.options.to ? `on ${esc(r.options.from)}` : `from ${esc(r.options.from)} to ${esc(r.options.to)}`}` +
    `${r.options.billable ? ", billable codes required" : ""}.</span>`;

  renderSystems(r);
  // The system column only for a list of several systems.
  const several = Object.keys(s.systems || {}).length > 1 || !!(s.by_system || []).length;
  $("findings").classList.toggle("one-system", !several);
  const all = findingRows(r);
  const kinds = new Map();
  for (const row of all) kinds.set(row.kind, (kinds.get(row.kind) || 0) + 1);
  const sel = $("kind-filter");
  const keep = sel.value;
  sel.innerHTML =
    `<option value="">all kinds (${all.length})</option>` +
    [...kinds].sort().map(([k, n]) => `<option value="${esc(k)}">${esc(k)} (${n})</option>`).join("");
  sel.value = kinds.has(keep) ? keep : "";
  state.allRows = all;
  state.shown = ROW_PAGE;
  renderRows();
  $("apply-safe").disabled = !all.some((x) => x.kind === "normalized" && x.entry && x.suggestions.length);
  renderCleaned();
  renderCoverage();
  renderChanges($("changes-box"), state.original, $("list").value);
  focusAfterFix();
}

/** Which systems the list holds, what each was checked against, and the loaded indexes. */
function renderSystems(r) {
  const p = $("systems-line");
  const parts = r.summary.by_system || [];
  if (!parts.length && !state.shapes) {
    p.hidden = true;
    p.textContent = "";
    return;
  }
  const how = (x) =>
    x.checked === "index"
      ? `index release ${x.release}`
      : x.checked === "not-loaded"
        ? "shape only (its index could not be loaded here)"
        : "shape and check digit only";
  const list = parts.length
    ? parts.map((x) => `${x.title}: ${x.entries.toLocaleString("en-US")} ${x.entries === 1 ? "entry" : "entries"} (${how(x)}; ${plural(x.errors, "error")})`)
    : [`${r.vocabulary}: shape and check digit only`];
  p.hidden = false;
  p.dataset.loaded = state.loaded.join(" ");
  const notices = parts.map((x) => x.notice).filter((n) => n && n !== r.index.notice);
  p.textContent = `By system: ${list.join(" · ")}. Indexes loaded: ${state.loaded.join(", ") || "none"}.` +
    (notices.length ? ` ${[...new Set(notices)].join(" ")}` : "");
}

/** The system of a findings row: its entry's, or that of the first line of a list finding. */
function rowSystem(x) {
  const e = x.entry || state.report.entries[x.line - 1];
  return (e && e.system) || "";
}

function renderRows() {
  const sevs = new Set([...document.querySelectorAll(".sev-filter")].filter((c) => c.checked).map((c) => c.value));
  const kind = $("kind-filter").value;
  const rows = state.allRows.filter((x) => sevs.has(x.severity) && (!kind || x.kind === kind));
  state.rows = rows;
  const body = $("findings").tBodies[0];
  const shown = rows.slice(0, state.shown);
  body.innerHTML = rowsHtml(shown, rowSystem);
  if (!rows.length) {
    body.innerHTML = `<tr><td colspan="6" class="hint">${state.allRows.length ? "No findings match the filter." : "No findings: every entry is fine for these options."}</td></tr>`;
  }
  resetTabStop(body);
  const more = $("findings-more");
  if (rows.length > shown.length) {
    more.hidden = false;
    more.innerHTML = `Showing ${shown.length.toLocaleString("en-US")} of ${rows.length.toLocaleString("en-US")} findings. <button type="button" id="show-more" class="secondary">Show ${Math.min(ROW_PAGE, rows.length - shown.length)} more</button>`;
  } else {
    more.hidden = true;
  }
}

/** After a fix: focus the finding that followed the fixed one (or the one now in its place). */
function focusAfterFix() {
  const want = state.focusAfter;
  state.focusAfter = null;
  if (!want) return;
  const body = $("findings").tBodies[0];
  let i = want.key ? state.rows.findIndex((x) => rowKey(x) === want.key) : -1;
  if (i < 0 || i >= state.shown) i = Math.min(want.index, state.rows.length - 1);
  if (!focusRow(body, i)) $("findings").focus();
}

// -------------------------------------------------------- applying fixes --

/**
 * Put new text in the list as a step the page made: recorded for undo and
 * redo, the list as pasted kept for the changes view, then checked.
 */
function setList(text, note) {
  const ta = $("list");
  const before = ta.value;
  if (state.original === null) state.original = before;
  ta.value = text;
  state.pageText = text;
  edits.record(before, text, note);
  syncUndo();
  $("edit-status").textContent = note;
}

/** Edit the list (in the worker, which knows the list's layout) and re-check. */
async function applyEdits(edits, note) {
  const ta = $("list");
  let text;
  try {
    text = await ask("edit", { text: ta.value, edits, reading: draft.reading() });
  } catch (e) {
    $("check-status").textContent = `Could not apply: ${pageWords(e.message.replace(/^Error: /, ""))}`;
    return;
  }
  setList(text, note);
  $("check-status").textContent = `${note} Checking…`;
  await runCheck();
}

/** What applying a suggestion does, in list edits and in words. */
function suggestionEdits(row, sugg) {
  if (row.entry) {
    // A code inside a longer line (a draft) is replaced where it stands.
    const column = row.entry.column ?? undefined;
    return { edits: [{ op: "replace", line: row.line, code: sugg.code, column }], note: `Line ${row.line}: now ${sugg.code}.` };
  }
  if (row.kind === "sibling-gap") {
    // A missing code: add it after the last line of the group.
    const after = Math.max(...row.lines);
    return { edits: [{ op: "add", after, code: sugg.code, label: sugg.description || null }], note: `Added ${sugg.code} after line ${after}.` };
  }
  // A finding about several lines (a roll-up): one line in their place. In
  // a draft several codes may share a line: only a line that holds nothing
  // but one of them goes; the others stay for the reader to remove.
  const lines = [...new Set(row.lines)];
  const [first, ...rest] = lines;
  const codesOn = (line) => state.report.entries.filter((e) => e.line === line && e.code).length;
  const gone = rest.filter((line) => codesOn(line) === 1);
  const firstEntry = state.report.entries.find((e) => e.line === first && e.code);
  return {
    edits: [
      { op: "replace", line: first, code: sugg.code, column: firstEntry?.column ?? undefined },
      ...gone.map((line) => ({ op: "remove", line })),
    ],
    note: `Lines ${lines.join(", ")}: now ${sugg.code}.`,
  };
}

/** Apply suggestion `j` of finding `i` (as shown); then the next finding has the focus. */
async function applySuggestion(i, j) {
  const row = state.rows[i];
  const sugg = row && row.suggestions[j];
  if (!sugg) return;
  const next = state.rows[i + 1];
  state.focusAfter = { index: i, key: next ? rowKey(next) : null };
  const { edits: list, note } = suggestionEdits(row, sugg);
  await applyEdits(list, note);
}

function applySafeFixes() {
  const fixes = state.allRows
    .filter((row) => row.kind === "normalized" && row.entry && row.suggestions.length)
    .map((row) => ({ op: "replace", line: row.line, code: row.suggestions[0].code, column: row.entry.column ?? undefined }));
  return applyEdits(fixes, `Applied ${plural(fixes.length, "formatting fix")}.`);
}

/** The undo and redo buttons follow the history; their descriptions say what each would do. */
function syncUndo() {
  $("undo").disabled = !edits.canUndo();
  $("redo").disabled = !edits.canRedo();
  $("undo-what").textContent = edits.canUndo() ? `Takes back: ${edits.nextUndo()}` : "";
  $("redo-what").textContent = edits.canRedo() ? `Makes again: ${edits.nextRedo()}` : "";
}

function undo() {
  const step = edits.undo($("list").value);
  if (!step) return;
  $("list").value = step.text;
  state.pageText = step.text;
  syncUndo();
  $("edit-status").textContent = `Undone: ${step.note}`;
  runCheck();
}

function redo() {
  const step = edits.redo($("list").value);
  if (!step) return;
  $("list").value = step.text;
  state.pageText = step.text;
  syncUndo();
  $("edit-status").textContent = `Redone: ${step.note}`;
  runCheck();
}

/**
 * Ctrl+Z / Ctrl+Shift+Z / Ctrl+Y anywhere but in a text field, and in the
 * list while it still holds what the page's last edit left there (after
 * typing, the browser's own undo takes the typing back first).
 */
function undoKeys(e) {
  if (!(e.ctrlKey || e.metaKey) || e.altKey) return;
  const key = e.key.toLowerCase();
  const isUndo = key === "z" && !e.shiftKey;
  const isRedo = (key === "z" && e.shiftKey) || key === "y";
  if (!isUndo && !isRedo) return;
  const t = e.target;
  const field = t && (t.isContentEditable || ["INPUT", "TEXTAREA", "SELECT"].includes(t.tagName));
  if (field && (t.id !== "list" || t.value !== state.pageText)) return;
  e.preventDefault();
  if (isUndo) undo();
  else redo();
}

// ---------------------------------------------------------- cleaned list --

function renderCleaned() {
  const { rows, leftOut } = cleanedRows(state.report);
  const body = $("cleaned").tBodies[0];
  const shown = rows.slice(0, 300);
  body.innerHTML =
    shown
      .map((r) => `<tr><td><code>${esc(r.code)}</code></td><td>${esc(r.label)}</td><td>${esc(r.description)}</td><td>${esc(r.status)}</td></tr>`)
      .join("") +
    (rows.length > shown.length ? `<tr><td colspan="4" class="hint">… and ${(rows.length - shown.length).toLocaleString("en-US")} more in the downloads.</td></tr>` : "") +
    (rows.length ? "" : '<tr><td colspan="4" class="hint">No usable codes yet.</td></tr>');
  const note = $("cleaned-left-out");
  note.hidden = !leftOut.length;
  note.dataset.count = String(leftOut.length);
  note.innerHTML = leftOut.length
    ? `<strong><span aria-hidden="true">✖</span> ${plural(leftOut.length, "entry", "entries")} left out for errors:</strong> ` +
      leftOut.map((l) => `line ${l.line} <code>${esc(l.code)}</code> (${esc(l.kinds.join(", "))})`).join("; ") + "."
    : "";
  for (const b of document.querySelectorAll("#copy-csv, #download-csv, #download-json, #download-fhir, button.export")) b.disabled = false;
}

/** One export, written by the core (the CLI's check --format NAME) for the list and options as checked. */
async function exportOf(format) {
  const opts = readOptions();
  return ask("export", {
    text: $("list").value,
    options: checkerOptions(opts),
    format,
    system: state.shapes || "",
    url: $("valueset-url").value,
  });
}

function leftOutWords(e) {
  return e.left_out.length ? `; ${plural(e.left_out.length, "entry", "entries")} with errors left out, named in the file` : "";
}

async function saveExport(format, what) {
  try {
    const e = await exportOf(format);
    download(e.filename, e.mime, e.text);
    exportStatus(`Saved ${what(e)}${leftOutWords(e)}.`);
  } catch (err) {
    exportStatus(`Could not export: ${pageWords(err.message.replace(/^Error: /, "").replace(/^cannot export: /, ""))}`);
  }
}

function exportStatus(text) {
  $("export-status").textContent = text;
}

// --------------------------------------------------------------- pictures --

async function requestStrips(report) {
  const seq = state.seq;
  // A one-release vocabulary (HPO) has no dates to draw.
  if (report.options.single_release) {
    $("strips").innerHTML = `<p class="hint">${esc(state.info.title)} is one release (${esc(state.info.release)}): its terms have no validity dates to draw. The bars below show the list's terms per category.</p>`;
    return;
  }
  const codes = [];
  const seen = new Set();
  for (const e of report.entries) {
    if (e.code == null || e.status === "pattern" || seen.has(e.code)) continue;
    // Strips come from the loaded index: codes of the list's own system only.
    if (e.system && e.system !== report.vocabulary) continue;
    seen.add(e.code);
    codes.push(e.code);
    if (codes.length >= STRIP_LIMIT) break;
  }
  let map = {};
  try {
    map = codes.length ? await ask("timelines", { codes }) : {};
  } catch (e) {
    $("strips").innerHTML = `<p class="problem">Could not draw the strips: ${esc(e.message)}</p>`;
    return;
  }
  if (seq !== state.seq) return;
  ensureDefs();
  const cov = { from: state.info.coverage_from, to: state.info.coverage_to };
  const period = { from: report.options.from, to: report.options.to };
  const total = seen.size;
  $("strips").innerHTML =
    codes
      .map((c) => {
        const spans = map[c] ?? null;
        const words = stripWords(spans);
        return `<div class="strip-row" data-code="${esc(c)}" role="img" aria-label="${esc(c)}: ${esc(words)}">` +
          `<code class="strip-code">${esc(c)}</code>${stripSvg(spans, cov, period)}<span class="strip-words">${esc(words)}</span></div>`;
      })
      .join("") +
    (codes.length === 0 ? '<p class="hint">No codes to draw yet.</p>' : "") +
    (total > codes.length ? `<p class="hint">The first ${codes.length} codes are drawn.</p>` : "");
}

function renderCoverage() {
  const rows = state.coverage || [];
  $("coverage").innerHTML = rows.length
    ? rows.map((c) => coverageRow(c, state.info && state.info.coverage_from === state.info.coverage_to ? "terms in use" : "billable codes")).join("")
    : '<p class="hint">No categories yet.</p>';
}

// ---------------------------------------------------------------- link --

async function updateLink(text, opts) {
  const status = $("link-status");
  const b = compareView.listB();
  if (text.length + b.length > LINK_LIMIT * 4) {
    status.textContent = "This list is too long to keep in a link.";
    return;
  }
  const frag = await encodeState({ text, options: opts, b });
  if (frag.length > LINK_LIMIT) {
    status.textContent = "This list is too long to keep in a link.";
    return;
  }
  history.replaceState(null, "", `${location.pathname}${location.search}#${frag}`);
  status.textContent = "";
}

async function restoreLink() {
  try {
    const s = await decodeState(location.hash);
    if (!s) return false;
    $("list").value = s.text;
    state.original = s.text;
    writeOptions(s.options);
    state.linkSystem = s.options.system;
    if (s.b) compareView.setB(s.b);
    $("link-status").textContent = "List and options restored from the link.";
    return true;
  } catch (e) {
    $("link-status").textContent = `This link's list could not be restored: ${e.message}.`;
    return false;
  }
}

// ---------------------------------------------------------------- files --

async function takeFile(file) {
  const msg = $("file-message");
  try {
    if (file.size > 50 * 1024 * 1024) throw new Error(`“${file.name}” is larger than 50 MB`);
    const bytes = new Uint8Array(await file.arrayBuffer());
    // The core tells a workbook from text and decodes it, as the CLI reads files.
    const read = await ask("decode", { bytes: bytes.slice().buffer }).catch((e) => {
      throw new Error(`“${file.name}”: ${e.message}`);
    });
    if (read.workbook) {
      await takeWorkbook(file.name, bytes);
      return;
    }
    const text = read.text;
    // A text file after a workbook is checked as text, not as the workbook.
    state.workbook = null;
    draft.workbookDropped(false);
    setList(text, `Read ${file.name}.`);
    state.original = text;
    msg.className = "file-message";
    const lines = text === "" ? 0 : text.replace(/\r\n?/g, "\n").replace(/\n$/, "").split("\n").length;
    msg.textContent = `Read ${lines} line${lines === 1 ? "" : "s"} from “${file.name}”; the checker finds the codes in it.`;
    runCheck();
  } catch (e) {
    msg.className = "file-message problem";
    msg.textContent = `Could not read the file: ${e.message}.`;
  }
}

/** A dropped workbook: checked from its bytes; its rows shown in the list. */
async function takeWorkbook(name, bytes) {
  state.workbook = { name, bytes };
  draft.workbookDropped(true);
  const before = state.report;
  await runCheck();
  const r = state.report;
  // A workbook that could not be read leaves the last list's report.
  if (!r || r === before || !state.workbook) return;
  draft.readAsWorkbook(r);
  // The rows as read, sheet by sheet, for reading and for editing as text.
  const out = [];
  let sheet = null;
  let last = 0;
  for (const e of r.entries) {
    if (e.line === last) continue;
    last = e.line;
    if (e.sheet && e.sheet !== sheet) {
      sheet = e.sheet;
      out.push(`# sheet ${sheet}`);
    }
    out.push(e.input);
  }
  $("list").value = out.join("\n");
  const sheets = (r.reading && r.reading.sheets) || [];
  const named = sheets.map((x) => `“${x.name}” (${x.codes ? `${x.codes} code${x.codes === 1 ? "" : "s"}` : "no codes"})`).join(", ");
  const msg = $("file-message");
  msg.className = "file-message";
  msg.textContent = `Read the workbook “${name}” as the command line reads it: sheets ${named}. The list shows its rows; editing it goes on with the rows as text.`;
}

// ---------------------------------------------------------------- wiring --

function wire() {
  draft = initDraft({
    ask,
    onChange: runCheck,
    entries: () => (state.report ? state.report.entries : []),
    openCard: (code, line) => card && card.open(code, line),
  });
  // A finding leads to its code in the list (the code itself, in a draft).
  $("findings").addEventListener("click", (e) => {
    const b = e.target.closest("button.to-token");
    if (!b) return;
    draft.showToken(Number(b.dataset.line), b.dataset.column ? Number(b.dataset.column) : undefined);
  });
  $("list").addEventListener("input", () => {
    state.workbook = null;
    draft.workbookDropped(false);
    scheduleCheck();
  });
  for (const id of ["opt-on", "opt-from", "opt-to", "opt-billable"]) $(id).addEventListener("change", scheduleCheck);
  for (const id of ["when-on", "when-period"])
    $(id).addEventListener("change", () => {
      syncModeFields();
      scheduleCheck();
    });
  $("check-now").addEventListener("click", runCheck);
  $("opt-system").addEventListener("change", (e) => switchSystem(e.target.value));
  // The single-file page carries the ICD-10-CM index only.
  if (embedded) $("system-row").hidden = true;
  $("apply-safe").addEventListener("click", applySafeFixes);
  for (const c of document.querySelectorAll(".sev-filter")) c.addEventListener("change", renderRows);
  $("kind-filter").addEventListener("change", renderRows);
  $("findings-more").addEventListener("click", (e) => {
    if (e.target.id === "show-more") {
      state.shown += ROW_PAGE;
      renderRows();
    }
  });

  wireFindings($("findings").tBodies[0], (i, j) => applySuggestion(i, j));
  $("undo").addEventListener("click", undo);
  $("redo").addEventListener("click", redo);
  document.addEventListener("keydown", undoKeys);
  $("try-demo").addEventListener("click", loadDemo);
  $("list").addEventListener("input", () => {
    // Until the page first changes it, the list as typed or pasted is the list "as pasted".
    if (!edits.canUndo()) state.original = $("list").value;
    syncDemo();
  });
  for (const id of ["opt-from", "opt-to"]) $(id).addEventListener("blur", () => setTimeout(scheduleCheck, 0));

  $("copy-csv").addEventListener("click", async () => {
    try {
      const e = await exportOf("cleaned-csv");
      await navigator.clipboard.writeText(e.text);
      exportStatus(`Copied ${plural(e.count, "code")} as CSV${leftOutWords(e)}.`);
    } catch (e) {
      exportStatus(`Could not copy (${e.message}); use Download CSV instead.`);
    }
  });
  $("download-csv").addEventListener("click", () => saveExport("cleaned-csv", (e) => `${plural(e.count, "code")} as CSV`));
  $("download-json").addEventListener("click", () => {
    download("rollcall-report.json", "application/json", toJsonReport(state.report));
    exportStatus("Saved the JSON report.");
  });
  $("download-fhir").addEventListener("click", () =>
    saveExport("fhir", (e) => `the FHIR ValueSet (${plural(e.count, "concept")})`),
  );
  const named = { "codes-csv": "CSV", "codes-sql": "a SQL IN (…) list", "codes-r": "an R vector", "codes-python": "a Python list" };
  for (const b of document.querySelectorAll("button.export")) {
    b.addEventListener("click", () =>
      saveExport(b.dataset.format, (e) => `${plural(e.count, "billable code")} as ${named[b.dataset.format]}`),
    );
  }
  $("copy-link").addEventListener("click", async () => {
    await updateLink($("list").value, readOptions());
    try {
      await navigator.clipboard.writeText(location.href);
      $("link-status").textContent = "Link copied.";
    } catch {
      $("link-status").textContent = "Copy the address from the address bar.";
    }
  });

  const zone = $("drop-zone");
  zone.addEventListener("dragover", (e) => {
    e.preventDefault();
    zone.classList.add("dragging");
  });
  zone.addEventListener("dragleave", () => zone.classList.remove("dragging"));
  zone.addEventListener("drop", (e) => {
    e.preventDefault();
    zone.classList.remove("dragging");
    const f = e.dataTransfer && e.dataTransfer.files[0];
    if (f) takeFile(f);
  });
  $("file-input").addEventListener("change", (e) => {
    const f = e.target.files[0];
    if (f) takeFile(f);
    e.target.value = "";
  });
  window.addEventListener("hashchange", async () => {
    if (await restoreLink()) checkPicked();
  });
}

const compareView = setupCompare({
  ask,
  options: () => {
    const o = readOptions();
    return periodPending(o) ? null : checkerOptions(o);
  },
  listA: () => $("list").value,
  ready: () => !!state.info,
  onCompared: () => updateLink($("list").value, readOptions()),
});
/** The word search adds a result as a new last line of the list. */
function addFromSearch(code, description) {
  const text = $("list").value;
  const after = text.replace(/\n$/, "") === "" ? 0 : text.replace(/\n$/, "").split("\n").length;
  return applyEdits([{ op: "add", after, code, label: description }], `Added ${code}.`);
}

// ------------------------------------------------------------------ demo --

/** "Try the demo list" is offered while the list is empty. */
function syncDemo() {
  $("demo-row").hidden = !state.info || $("list").value.trim() !== "";
}

async function loadDemo() {
  try {
    const text = embedded ? embedded.demo : await (await fetch("demo-list.tsv")).text();
    setList(text, "Put in the demo list.");
    state.original = text;
    runCheck();
    $("list").focus();
  } catch (e) {
    $("check-status").textContent = `Could not load the demo list: ${e.message}`;
  }
}

/** The code card adds the codes checked in it as new last lines. */
function addCodes(codes) {
  const text = $("list").value.replace(/\n$/, "");
  const after = text === "" ? 0 : text.split("\n").length;
  const edits = codes.map(({ code, label }) => ({ op: "add", after, code, label }));
  return applyEdits(edits, `Added ${codes.map((c) => c.code).join(", ")}.`);
}

async function main() {
  document.body.dataset.state = "loading";
  wire();
  initSearch({ ask, addToList: addFromSearch });
  renderGlossary($("glossary-list"));
  card = initCard({
    ask,
    loadNotes: () => (checker ? checker.loadNotes() : Promise.reject(new Error("the index is not loaded"))),
    options: () => checkerOptions(readOptions()),
    coverage: () => ({ from: state.info.coverage_from, to: state.info.coverage_to }),
    addCodes,
    replaceLine: (line, code) => applyEdits([{ op: "replace", line, code }], `Line ${line} is now ${code}.`),
  });
  syncModeFields();
  syncUndo();
  const restored = restoreLink();
  let info;
  try {
    info = await loadIndex();
  } catch (e) {
    showIndexError(e.message);
    return;
  }
  state.indexKey = info.vocabulary;
  showIndexReady(info);
  compareView.enable();
  await restored;
  await loadSiteIndexes();
  syncDemo();
  if ($("list").value.trim() || $("opt-system").value !== state.indexKey) checkPicked();
}

main();
