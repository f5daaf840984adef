// The list as a draft: says how the checker read it, lets the user choose
// another reading, marks in the list the words taken as codes, leads from a
// finding to its code in the list and from a code in the list to its card.
// The reading itself is the core's (Checker.read / readDraft): nothing here
// decides what a code is or where it stands.

function esc(s) {
  return String(s).replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]);
}

function plural(n, one, many) {
  return `${n.toLocaleString("en-US")} ${n === 1 ? one : many}`;
}

/** The sentence that says how a list was read (plain text). */
export function readingSentence(report) {
  const f = report.reading;
  if (!f) {
    const s = report.summary;
    return s.entries ? `Read as a list: ${plural(s.entries, "code", "codes")} on ${plural(s.lines, "line", "lines")}.` : "";
  }
  const unit = f.as === "workbook" ? ["row", "rows"] : ["line", "lines"];
  let out = `Read as ${f.form}${f.forced ? " (as you chose)" : ""}: ${plural(f.codes, "code", "codes")} on ${f.lines_with_codes.toLocaleString("en-US")} of ${plural(f.lines, unit[0], unit[1])}.`;
  if (f.sheets && f.sheets.length) {
    out += ` Sheets: ${f.sheets.map((x) => `“${x.name}” (${x.codes ? plural(x.codes, "code", "codes") : "no codes"})`).join(", ")}.`;
  }
  for (const n of f.notes || []) out += ` Note: ${n}.`;
  return out;
}

/**
 * Wire the reading controls and the marks behind the list. `ask(type,
 * payload)` talks to the worker; `onChange()` re-checks; `entries()` are
 * the last report's entries; `openCard(code, line)` opens a code's card.
 */
export function initDraft({ ask, onChange, entries, openCard }) {
  const list = document.getElementById("list");
  const marks = document.getElementById("list-marks");
  const select = document.getElementById("opt-reading");
  const asWorkbook = select.querySelector('option[value="workbook"]');
  const atCaret = document.getElementById("card-at-caret");
  const caretStatus = document.getElementById("caret-status");
  let tokens = [];
  // The text the tokens were read from: once the list is typed in, their
  // places no longer hold until the next reading.
  let marked = null;
  let seq = 0;

  const sync = () => {
    marks.scrollTop = list.scrollTop;
    marks.scrollLeft = list.scrollLeft;
  };
  list.addEventListener("scroll", sync);
  select.addEventListener("change", onChange);

  /** Mark the codes of the text as the core reads them (large lists: none). */
  async function mark(text) {
    const mine = ++seq;
    if (text.length > 400_000) {
      marks.textContent = "";
      tokens = [];
      marked = null;
      syncCaret();
      return;
    }
    const found = await ask("read", { text, reading: reading() });
    if (mine !== seq) return;
    tokens = found.tokens;
    marked = text;
    syncCaret();
    let html = "";
    let at = 0;
    for (const t of tokens) {
      if (t.start < at) continue;
      html += esc(text.slice(at, t.start)) + `<mark>${esc(text.slice(t.start, t.end))}</mark>`;
      at = t.end;
    }
    // A final newline needs a character after it to keep the heights equal.
    marks.innerHTML = html + esc(text.slice(at)) + "\u200b";
    sync();
  }

  function reading() {
    return select.value === "auto" ? undefined : select.value;
  }

  /** Select the code of an entry in the list (line, and column when known). */
  function showToken(line, column) {
    const on = tokens.filter((t) => t.line === line);
    if (!on.length) return false;
    const t = on.find((x) => x.column === column) || on[0];
    list.focus();
    list.setSelectionRange(t.start, t.end);
    return true;
  }

  /** The token taken as a code that the selection is in or next to. */
  function tokenAtCaret() {
    if (marked === null || list.value !== marked) return null;
    const a = list.selectionStart;
    const b = list.selectionEnd;
    return tokens.find((t) => t.start <= b && a <= t.end) || null;
  }

  function syncCaret() {
    const t = tokenAtCaret();
    atCaret.disabled = !t;
    if (t) caretStatus.textContent = "";
  }

  /**
   * Open the card of the code at the caret. The code is the one the check
   * took at the token's line and column (I5O.9 read as I50.9), so the card
   * is of the code the findings speak of.
   */
  function openAtCaret() {
    const t = tokenAtCaret();
    if (!t) {
      caretStatus.textContent = "The cursor is not in a code taken from the list.";
      return false;
    }
    caretStatus.textContent = "";
    const column = t.column ?? null;
    const entry = entries().find((e) => e.line === t.line && (e.column ?? null) === column && e.code);
    openCard(entry ? entry.code : t.code, t.line);
    return true;
  }

  for (const type of ["keyup", "mouseup", "select", "focus"]) list.addEventListener(type, syncCaret);
  document.addEventListener("selectionchange", syncCaret);
  list.addEventListener("input", syncCaret);
  list.addEventListener("keydown", (e) => {
    if (e.key !== "Enter" || !e.altKey || e.ctrlKey || e.metaKey || e.shiftKey) return;
    e.preventDefault();
    openAtCaret();
  });
  list.addEventListener("dblclick", () => {
    const t = tokenAtCaret();
    if (!t) return;
    // The word a double-click selects may stop short of the code (at its dot).
    list.setSelectionRange(t.start, t.end);
    openAtCaret();
  });
  atCaret.addEventListener("click", openAtCaret);

  /**
   * Whether a dropped workbook is the list. Only a file's bytes can be read
   * as a workbook (text given that reading is read as a table), so the
   * picker offers it only then; the marks go, for the rows shown are not
   * the file the checker read.
   */
  function workbookDropped(on) {
    asWorkbook.hidden = !on;
    asWorkbook.disabled = !on;
    if (on) {
      // A new file starts from the checker's guess: a reading chosen for
      // the text before would read no workbook's bytes.
      if (select.value !== "workbook") select.value = "auto";
      ++seq;
      tokens = [];
      marked = null;
      marks.textContent = "";
      syncCaret();
    } else if (select.value === "workbook") {
      select.value = "auto";
    }
  }

  /** A dropped file the checker read as a workbook: the picker says so. */
  function readAsWorkbook(report) {
    if (!asWorkbook.disabled && report.reading && report.reading.as === "workbook") select.value = "workbook";
  }

  return { mark, reading, showToken, openAtCaret, workbookDropped, readAsWorkbook };
}
