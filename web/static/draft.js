// The list as a draft: says how the checker read it, lets the user choose
// another reading, marks in the list the words taken as codes, and leads
// from a finding to its code in the list. The reading itself is the core's
// (Checker.read / readDraft): nothing here decides what a code is.

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
 * payload)` talks to the worker; `onChange()` re-checks.
 */
export function initDraft({ ask, onChange }) {
  const list = document.getElementById("list");
  const marks = document.getElementById("list-marks");
  const select = document.getElementById("opt-reading");
  let tokens = [];
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
      return;
    }
    const found = await ask("read", { text, reading: reading() });
    if (mine !== seq) return;
    tokens = found.tokens;
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

  return { mark, reading, showToken };
}
