// The form checker: a findings panel under every textarea marked
// `data-rollcall-check`, live as the list is typed; while error-level
// findings remain, the form's submit is held (or only warned about), and on
// submit a hidden field gets a compact summary of the check. A code read in
// another form than the official one (a `normalized` finding: "I1O" read as
// I10) is written in its official form before the form is sent, and the
// panel says so; every suggestion in the panel is a button that puts it in
// the list. Built on the
// module API (rollcall.js); the panel lives in a shadow root so the page's
// styles and the panel's never meet. Every string from the list reaches the
// DOM as text (textContent), never as markup.
//
//   <script type="module" src="rollcall/form-check.js"></script>
//   <textarea name="codes" data-rollcall-check="icd10cm" data-rollcall-from="2019-01-01"
//             data-rollcall-to="2024-12-31" data-rollcall-billable></textarea>

import { open, openSite, readManifest } from "./rollcall.js";

const HERE = new URL(".", import.meta.url);
const SUMMARY_FORMAT = "rollcall-summary/1";
const SHOWN = 50;
const SEVERITY_ICON = { error: "✖", warning: "▲", info: "●" };
const CAUTION =
  "rollcall helps assemble research code lists; it is not coding or billing advice; official coding guidelines and local policy prevail.";

const CSS = `
:host { display: block; margin: 0.4em 0 1em; font: 0.9rem/1.45 system-ui, sans-serif; color: #1d2430; }
.panel { border: 1px solid #a9b4c2; border-radius: 6px; padding: 0.5em 0.75em; background: #f7f9fb; }
.status { margin: 0; font-weight: 600; }
.hold { margin: 0.5em 0 0; padding: 0.4em 0.6em; border-left: 4px solid #a4262c; background: #fdeceb; }
.hold.warn { border-left-color: #8a5a00; background: #fff5dc; }
.hold:focus { outline: 2px solid #1f5fa8; outline-offset: 2px; }
ul { list-style: none; margin: 0.4em 0 0; padding: 0; max-height: 16em; overflow: auto; }
li { padding: 0.2em 0; border-top: 1px solid #e1e6ec; }
li:first-child { border-top: 0; }
.sev { font-weight: 600; white-space: nowrap; }
.sev-error { color: #a4262c; }
.sev-warning { color: #8a5a00; }
.sev-info { color: #28527a; }
code { font: 0.85rem ui-monospace, monospace; background: #e8edf3; padding: 0 0.25em; border-radius: 3px; }
button { font: inherit; font-size: 0.85rem; padding: 0.1em 0.5em; min-height: 24px; border: 1px solid #5b6878; border-radius: 4px; background: #fff; color: #1d2430; cursor: pointer; }
button:focus-visible { outline: 3px solid #1f5fa8; outline-offset: 2px; }
.applied { margin: 0.5em 0 0; padding: 0.4em 0.6em; border-left: 4px solid #28527a; background: #eaf1f8; }
.more, .caution { margin: 0.4em 0 0; font-size: 0.8rem; color: #4a5563; }
`;

let sheet = null;
function styles() {
  if (!sheet) {
    sheet = new CSSStyleSheet();
    sheet.replaceSync(CSS);
  }
  return sheet;
}

/** One checker per index URL, shared by every textarea that uses it. */
const checkers = new Map();
function checkerFor(indexUrl, manifestUrl) {
  const key = `${indexUrl} ${manifestUrl}`;
  if (!checkers.has(key)) checkers.set(key, open(indexUrl, { manifest: manifestUrl }));
  return checkers.get(key);
}

/**
 * One request to a worker that has opened no index yet: the worker speaks
 * the protocol of worker.js, and `open` takes it over afterwards.
 */
function askWorker(worker, type) {
  return new Promise((resolve, reject) => {
    const id = `${type}-first`;
    const done = () => {
      worker.removeEventListener("message", onMessage);
      worker.removeEventListener("error", onError);
    };
    const onMessage = (event) => {
      const reply = event.data || {};
      if (reply.id !== id) return;
      done();
      if (reply.ok) resolve(reply.result);
      else reject(new Error(reply.error));
    };
    const onError = (event) => {
      if (event.preventDefault) event.preventDefault();
      done();
      reject(new Error(`the checker could not start: ${event.message || "the worker failed to load"}`));
    };
    worker.addEventListener("message", onMessage);
    worker.addEventListener("error", onError);
    worker.postMessage({ id, type });
  });
}

/**
 * The checker of the core's default system (ICD-10-CM), for a textarea that
 * names no index: its manifest (or the one the textarea names) is the one
 * the core gives it, and the index is the file that manifest names.
 */
function checkerForDefault(manifestUrl) {
  const key = `default ${manifestUrl}`;
  if (!checkers.has(key)) {
    checkers.set(
      key,
      (async () => {
        const worker = new Worker(new URL("worker.js", HERE));
        try {
          const systems = await askWorker(worker, "bundled");
          const first = systems.find((s) => s.default);
          const manifest = await readManifest(manifestUrl || new URL(first.manifest, HERE).href);
          if (!manifest.file) throw new Error("the index manifest names no index file; give data-rollcall-index too");
          return await open(new URL(manifest.file, HERE).href, { manifest, worker });
        } catch (e) {
          worker.terminate();
          throw e;
        }
      })(),
    );
  }
  return checkers.get(key);
}

/** One checker per site index (by its name in site-indexes.json), shared the same way. */
function checkerForSite(name) {
  const key = `site ${name}`;
  if (!checkers.has(key)) checkers.set(key, openSite(name));
  return checkers.get(key);
}

function el(tag, attrs = {}, text = null) {
  const e = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, v);
  if (text !== null) e.textContent = text;
  return e;
}

function plural(n, word) {
  return `${n.toLocaleString("en-US")} ${word}${n === 1 ? "" : "s"}`;
}

/** A date attribute: a YYYY-MM-DD value, or `#id` of a field that holds one. */
function dateFrom(value) {
  if (!value) return null;
  if (value.startsWith("#")) {
    const field = document.getElementById(value.slice(1));
    // No such field: the value goes on as written, and the check says it is not a date.
    return field ? field.value || null : value;
  }
  return value;
}

/** The check options a textarea's attributes ask for. */
export function optionsOf(textarea) {
  const d = textarea.dataset;
  const billable = d.rollcallBillable !== undefined && d.rollcallBillable !== "false";
  if (d.rollcallFrom !== undefined || d.rollcallTo !== undefined) {
    return { from: dateFrom(d.rollcallFrom), to: dateFrom(d.rollcallTo), billable };
  }
  return { on: dateFrom(d.rollcallOn), billable };
}

/** Each finding of a report as {lines, code, severity, kind, message}, errors first. */
function findingsOf(report) {
  const rows = [];
  for (const e of report.entries) {
    for (const f of e.findings) rows.push({ lines: [e.line], code: e.code ?? e.input.trim(), entry: true, ...f });
  }
  for (const f of report.list_findings) rows.push({ lines: f.lines, code: f.codes.join(", "), ...f });
  const rank = { error: 0, warning: 1, info: 2 };
  rows.sort((a, b) => (rank[a.severity] ?? 3) - (rank[b.severity] ?? 3) || (a.lines[0] ?? 0) - (b.lines[0] ?? 0));
  return rows;
}

/** The compact summary the hidden field receives. */
export function summaryOf(report, info, listSha256) {
  const kinds = {};
  for (const e of report.entries) for (const f of e.findings) kinds[f.kind] = (kinds[f.kind] || 0) + 1;
  for (const f of report.list_findings) kinds[f.kind] = (kinds[f.kind] || 0) + 1;
  const s = report.summary;
  return {
    format: SUMMARY_FORMAT,
    checked: true,
    vocabulary: report.vocabulary,
    release: info.release,
    index_sha256: info.sha256,
    options: report.options,
    lines: s.lines,
    entries: s.entries,
    errors: s.errors,
    warnings: s.warnings,
    infos: s.infos,
    kinds: Object.fromEntries(Object.entries(kinds).sort(([a], [b]) => (a < b ? -1 : 1))),
    list_sha256: listSha256,
  };
}

/** Put the caret on (and select) line `n` of a textarea. */
function goToLine(textarea, n) {
  const lines = textarea.value.split("\n");
  let start = 0;
  for (let i = 0; i < n - 1 && i < lines.length; i++) start += lines[i].length + 1;
  const end = start + (lines[n - 1] ?? "").length;
  textarea.focus();
  textarea.setSelectionRange(start, end);
}

/** The panel and checking for one textarea. */
class FormList {
  constructor(textarea) {
    this.textarea = textarea;
    this.form = textarea.form;
    this.mode = textarea.dataset.rollcallSubmit === "warn" ? "warn" : "hold";
    this.summaryName = textarea.dataset.rollcallSummary || `${textarea.name || "list"}_rollcall`;
    this.seq = 0;
    this.result = null; // {text, options, report, digest}
    this.problem = null; // why the list could not be checked
    this.timer = 0;
    this.label = (textarea.labels && textarea.labels[0] && textarea.labels[0].textContent.trim()) || "the code list";
    this.build();
    const idx = textarea.dataset.rollcallIndex;
    const manifestUrl = textarea.dataset.rollcallManifest
      ? new URL(textarea.dataset.rollcallManifest, document.baseURI).href
      : null;
    this.setState("loading");
    this.status.textContent = "Loading the index to check this list…";
    // A site's own index, named as site-indexes.json beside this file lists it.
    const site = textarea.dataset.rollcallSite;
    const opening = site
      ? checkerForSite(site)
      : idx
        ? checkerFor(new URL(idx, document.baseURI).href, manifestUrl)
        : checkerForDefault(manifestUrl);
    this.ready = opening.then(
      (checker) => {
        this.checker = checker;
        const want = textarea.dataset.rollcallCheck;
        if (want && want !== checker.info.vocabulary) {
          throw new Error(`this list asks for the vocabulary “${want}” but the index holds “${checker.info.vocabulary}”`);
        }
        return this.check();
      },
      (e) => {
        throw e;
      },
    ).catch((e) => this.fail(e));
    textarea.addEventListener("input", () => this.schedule());
    for (const attr of [textarea.dataset.rollcallOn, textarea.dataset.rollcallFrom, textarea.dataset.rollcallTo]) {
      if (attr && attr.startsWith("#")) {
        const field = document.getElementById(attr.slice(1));
        if (field) field.addEventListener("change", () => this.schedule());
      }
    }
  }

  build() {
    this.host = el("div", { class: "rollcall-panel" });
    const root = this.host.attachShadow({ mode: "open" });
    root.adoptedStyleSheets = [styles()];
    const panel = el("div", { class: "panel", part: "panel", role: "group", "aria-label": `Check of ${this.label}` });
    this.status = el("p", { class: "status", role: "status", "aria-live": "polite" });
    this.hold = el("p", { class: "hold", role: "alert", tabindex: "-1" });
    this.hold.hidden = true;
    this.applied = el("p", { class: "applied", role: "status" });
    this.applied.hidden = true;
    this.list = el("ul", { "aria-label": `Findings for ${this.label}` });
    this.more = el("p", { class: "more" });
    this.more.hidden = true;
    panel.append(this.status, this.hold, this.applied, this.list, this.more, el("p", { class: "caution" }, `Caution: ${CAUTION}`));
    root.append(panel);
    this.textarea.insertAdjacentElement("afterend", this.host);
  }

  setState(state) {
    this.textarea.dataset.rollcallState = state;
  }

  schedule() {
    clearTimeout(this.timer);
    this.hold.hidden = true;
    this.timer = setTimeout(() => this.check(), 300);
  }

  /** Whether the last result is of the list and options as they are now. */
  fresh() {
    return this.result && this.result.text === this.textarea.value && JSON.stringify(this.result.options) === JSON.stringify(optionsOf(this.textarea));
  }

  async check() {
    clearTimeout(this.timer);
    if (!this.checker) return this.ready;
    const seq = ++this.seq;
    const text = this.textarea.value;
    const options = optionsOf(this.textarea);
    this.setState("checking");
    try {
      const [report, digest] = await Promise.all([this.checker.check(text, options), this.checker.digest(text)]);
      if (seq !== this.seq) return;
      this.problem = null;
      this.result = { text, options, report, digest };
      this.render(report);
      this.textarea.dataset.rollcallErrors = String(report.summary.errors);
      this.setState("checked");
    } catch (e) {
      if (seq !== this.seq) return;
      this.fail(e);
    }
  }

  fail(e) {
    this.result = null;
    this.problem = String(e && e.message ? e.message : e).replace(/^Error: /, "");
    this.status.textContent = `This list could not be checked: ${this.problem}`;
    this.list.replaceChildren();
    this.more.hidden = true;
    this.setState("error");
  }

  render(report) {
    const s = report.summary;
    const o = report.options;
    const when = o.from === o.to ? `on ${o.from}` : `from ${o.from} to ${o.to}`;
    this.status.textContent =
      `${plural(s.errors, "error")}, ${plural(s.warnings, "warning")}, ${s.infos.toLocaleString("en-US")} info ` +
      `in ${s.entries.toLocaleString("en-US")} code ${s.entries === 1 ? "entry" : "entries"}; ${this.checker.info.title} release ${this.checker.info.release}, ${when}` +
      `${o.billable ? ", billable codes required" : ""}.`;
    const rows = findingsOf(report);
    const items = rows.slice(0, SHOWN).map((f) => {
      const li = el("li", { "data-kind": f.kind, "data-severity": f.severity });
      const line = f.lines[0];
      if (line) {
        const go = el("button", { type: "button", "aria-label": `Go to line ${line} of the list` }, `Line ${f.lines.join(", ")}`);
        go.addEventListener("click", () => goToLine(this.textarea, line));
        li.append(go, " ");
      }
      const sev = el("span", { class: `sev sev-${f.severity}` });
      sev.append(el("span", { "aria-hidden": "true" }, `${SEVERITY_ICON[f.severity] || "?"} `), f.severity);
      const message = /[.!?]$/.test(f.message) ? f.message : `${f.message}.`;
      li.append(sev, " ", el("code", {}, f.code), ` ${f.kind}: ${message}`);
      // A suggestion for one line is a button that writes it on that line.
      if (f.suggestions && f.suggestions.length && f.lines.length === 1 && f.entry) {
        li.append(" Use: ");
        f.suggestions.slice(0, 3).forEach((x, k) => {
          const use = el("button", { type: "button", class: "use", title: x.description || "" }, x.code);
          use.setAttribute("aria-label", `Use ${x.code} on line ${line}`);
          use.addEventListener("click", () => this.replace([{ op: "replace", line, code: x.code }], `Line ${line}: now ${x.code}.`));
          li.append(k ? " " : "", use);
        });
      } else if (f.suggestions && f.suggestions.length) {
        li.append(` Suggested: ${f.suggestions.slice(0, 3).map((x) => x.code).join(", ")}.`);
      }
      return li;
    });
    this.list.replaceChildren(...items);
    this.more.hidden = rows.length <= SHOWN;
    this.more.textContent = rows.length > SHOWN ? `… and ${rows.length - SHOWN} more findings.` : "";
  }

  /** Apply edits to the list, say what changed, and check it again. */
  async replace(edits, note) {
    if (!this.checker) return;
    try {
      this.textarea.value = await this.checker.edit(this.textarea.value, edits);
    } catch (e) {
      this.applied.hidden = false;
      this.applied.textContent = `Could not change the list: ${String(e.message || e).replace(/^Error: /, "")}`;
      return;
    }
    this.applied.hidden = false;
    this.applied.textContent = note;
    // Other scripts of the form page hear of the change as of typing.
    this.textarea.dispatchEvent(new Event("input", { bubbles: true }));
    await this.check();
  }

  /**
   * Codes read in another form than the official one (normalized
   * findings): their official form, as edits. The form sends the list as
   * the checker read it, never "I1O" for I10.
   */
  readings() {
    if (!this.result) return [];
    return this.result.report.entries
      .filter((e) => e.findings.some((f) => f.kind === "normalized" && f.suggestions.length))
      .map((e) => ({ line: e.line, from: e.input.trim(), code: e.findings.find((f) => f.kind === "normalized").suggestions[0].code }));
  }

  /** Write the official forms into the list before it is sent; true when something changed. */
  async applyReadings() {
    const r = this.readings();
    if (!r.length) return false;
    const words = r.map((x) => `line ${x.line} ${x.code} (written “${x.from.split(/[\t,]/)[0].trim()}”)`).join("; ");
    await this.replace(
      r.map((x) => ({ op: "replace", line: x.line, code: x.code })),
      `Written in the official form before sending: ${words}.`,
    );
    return true;
  }

  /** Write the summary into the form's hidden field. */
  writeSummary() {
    let field = [...this.form.elements].find((e) => e.name === this.summaryName && e.type === "hidden");
    if (!field) {
      field = el("input", { type: "hidden", name: this.summaryName });
      this.form.append(field);
    }
    field.value = JSON.stringify(
      this.result
        ? summaryOf(this.result.report, this.checker.info, this.result.digest)
        : { format: SUMMARY_FORMAT, checked: false, reason: this.problem || "the list was not checked" },
    );
  }

  /** Whether this list holds the submit; shows the message when it does. */
  holds() {
    this.writeSummary();
    const errors = this.result ? this.result.report.summary.errors : 0;
    if (!errors) {
      this.hold.hidden = true;
      return false;
    }
    this.hold.hidden = false;
    if (this.mode === "warn") {
      this.hold.className = "hold warn";
      this.hold.textContent = `Sent with ${plural(errors, "error")} in ${this.label}; the summary sent with the form says so.`;
      return false;
    }
    this.hold.className = "hold";
    this.hold.textContent = `Not sent: ${this.label} has ${plural(errors, "error")} (listed below). Correct them, then send the form again.`;
    this.hold.focus();
    return true;
  }
}

/** Hold a form's submit until its lists are checked, then let it go or hold it. */
function guard(form) {
  if (form.rollcallLists) return form.rollcallLists;
  const lists = [];
  form.rollcallLists = lists;
  let releasing = false;
  form.addEventListener("submit", (event) => {
    if (releasing) return;
    const stale = lists.filter((l) => l.checker && !l.fresh() && !l.problem);
    const loading = lists.filter((l) => !l.checker && !l.problem);
    const readings = lists.filter((l) => l.fresh() && l.readings().length);
    if (stale.length || loading.length || readings.length) {
      // Check the lists as they are now, write codes in their official form,
      // then submit again with the same button.
      event.preventDefault();
      const submitter = event.submitter || null;
      Promise.all(lists.map((l) => (l.fresh() || l.problem ? null : l.ready.then(() => (l.fresh() ? null : l.check())))))
        .then(() => Promise.all(lists.map((l) => (l.problem ? false : l.applyReadings()))))
        .then(() => {
          if (lists.map((l) => l.holds()).some(Boolean)) return;
          // requestSubmit dispatches the submit event at once, or none when the
          // form's own validation fails; either way the flag is over after it.
          releasing = true;
          try {
            if (submitter) form.requestSubmit(submitter);
            else form.requestSubmit();
          } finally {
            releasing = false;
          }
        });
      return;
    }
    if (lists.map((l) => l.holds()).some(Boolean)) event.preventDefault();
  });
  return lists;
}

/** Attach the checker to one textarea (in a form); returns its controller. */
export function attach(textarea) {
  if (textarea.rollcall) return textarea.rollcall;
  if (!(textarea instanceof HTMLTextAreaElement)) throw new TypeError("the form checker attaches to a <textarea>");
  const list = new FormList(textarea);
  textarea.rollcall = list;
  if (textarea.form) guard(textarea.form).push(list);
  return list;
}

/** Attach the checker to every marked textarea under `root`. */
export function attachAll(root = document) {
  return [...root.querySelectorAll("textarea[data-rollcall-check]")].map(attach);
}

if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", () => attachAll());
else attachAll();
