// The findings table: one row per finding (a card below ~700 px wide), each
// readable in full: the line, the code as written, the severity in words
// with a shape, the kind (a link to the glossary), the message and every
// suggestion as a button. Keyboard: the table is one tab stop; arrow keys
// move between findings, Right/Left between a finding's suggestions (and the
// button that shows the rest), Enter on a finding applies its first
// suggestion, digits 1-9 the n-th.

import { esc } from "./pictures.js";
import { explains, kindId, showKind } from "./glossary.js";
import { pageWords } from "./wording.js";

const SEVERITY_ICON = { error: "✖", warning: "▲", info: "●" };
const SEVERITY_WORD = { error: "error", warning: "warning", info: "info" };
// Suggestions shown at first; the rest behind a "more" button (a finding
// with a dozen near codes would otherwise fill the screen).
const FIRST_SUGGESTIONS = 3;

/** The markup of the rows (every value escaped). */
export function rowsHtml(rows, rowSystem) {
  return rows
    .map((x, i) => {
      const verb = x.kind === "sibling-gap" ? "Add" : "Use";
      const sugg = x.suggestions
        .map(
          (sg, j) =>
            `<li${j >= FIRST_SUGGESTIONS ? ' class="later" hidden' : ""}><button type="button" class="suggestion" data-row="${i}" data-sugg="${j}" tabindex="-1" ` +
            `aria-describedby="sg-${i}-${j}">${verb} <code>${esc(sg.code)}</code></button>` +
            `<span class="sugg-desc" id="sg-${i}-${j}">${esc(sg.description)}${sg.reason ? ` — ${esc(sg.reason)}` : ""}</span></li>`,
        )
        .join("");
      const later = x.suggestions.length - FIRST_SUGGESTIONS;
      const more =
        later > 0
          ? `<button type="button" class="sugg-more secondary" tabindex="-1" aria-expanded="false">${later} more suggestion${later === 1 ? "" : "s"}</button>`
          : "";
      const lines = x.lines.length > 1 ? x.lines.join(", ") : String(x.line);
      const kind = explains(x.kind)
        ? `<a class="kind-link" href="#${kindId(x.kind)}" data-kind="${esc(x.kind)}" tabindex="-1">${esc(x.kind)}<span class="visually-hidden"> (what this means)</span></a>`
        : esc(x.kind);
      const sys = rowSystem(x);
      return (
        `<tr tabindex="${i === 0 ? 0 : -1}" data-row="${i}" data-line="${x.line}" data-lines="${x.lines.join(",")}" data-kind="${esc(x.kind)}" data-severity="${esc(x.severity)}" data-system="${esc(sys)}">` +
        `<td class="num" data-label="Line">${
          x.entry
            ? `<button type="button" class="to-token link-like" tabindex="-1" data-line="${x.line}" data-column="${x.entry.column ?? ""}" title="Show line ${x.line} in the list">${lines}</button>`
            : lines
        }</td>` +
        `<td class="input" data-label="Code"><code>${esc(x.input)}</code></td>` +
        `<td class="system" data-label="System">${esc(sys)}</td>` +
        `<td class="sev-cell" data-label="Severity"><span class="sev sev-${esc(x.severity)}"><span aria-hidden="true">${SEVERITY_ICON[x.severity] || "?"}</span> ${SEVERITY_WORD[x.severity] || esc(x.severity)}</span></td>` +
        `<td class="what" data-label="Finding"><span class="kind">${kind}</span> <span class="message">${esc(pageWords(x.message))}</span></td>` +
        `<td class="suggs" data-label="Suggestions">${sugg ? `<ul class="sugg-list">${sugg}</ul>${more}` : '<span class="hint">none</span>'}</td></tr>`
      );
    })
    .join("");
}

function rowsOf(body) {
  return [...body.querySelectorAll("tr[data-row]")];
}

/** Make row `tr` the table's one tab stop; its suggestions and kind link become tabbable too. */
function activate(body, tr) {
  for (const r of rowsOf(body)) {
    const on = r === tr;
    r.tabIndex = on ? 0 : -1;
    for (const b of r.querySelectorAll("button.suggestion, button.sugg-more, a.kind-link")) b.tabIndex = on ? 0 : -1;
  }
}

/** Focus finding `i` (clamped), making it the tab stop; false when there are none. */
export function focusRow(body, i) {
  const rows = rowsOf(body);
  if (!rows.length) return false;
  const tr = rows[Math.max(0, Math.min(i, rows.length - 1))];
  activate(body, tr);
  tr.focus();
  tr.scrollIntoView({ block: "nearest" });
  return true;
}

/** The tab stop after a re-render: the first row. */
export function resetTabStop(body) {
  const rows = rowsOf(body);
  if (rows.length) activate(body, rows[0]);
}

/**
 * Wire the table body: `apply(index, suggestionIndex)` applies a
 * suggestion of finding `index` (of the rows as shown).
 */
export function wireFindings(body, apply) {
  body.addEventListener("click", (e) => {
    const link = e.target.closest("a.kind-link");
    if (link) {
      e.preventDefault();
      showKind(link.dataset.kind);
      return;
    }
    const toggle = e.target.closest("button.sugg-more");
    if (toggle) {
      const open = toggle.getAttribute("aria-expanded") !== "true";
      toggle.setAttribute("aria-expanded", String(open));
      for (const li of toggle.closest("td").querySelectorAll("li.later")) li.hidden = !open;
      const n = toggle.closest("td").querySelectorAll("li.later").length;
      toggle.textContent = open ? "fewer suggestions" : `${n} more suggestion${n === 1 ? "" : "s"}`;
      // The first of the suggestions just shown takes the focus.
      const shown = toggle.closest("td").querySelector("li.later button");
      if (open && shown) shown.focus();
      return;
    }
    const b = e.target.closest("button.suggestion");
    if (b) apply(Number(b.dataset.row), Number(b.dataset.sugg));
  });
  body.addEventListener("focusin", (e) => {
    const tr = e.target.closest("tr[data-row]");
    if (tr && tr.tabIndex !== 0) activate(body, tr);
  });
  body.addEventListener("keydown", (e) => {
    const tr = e.target.closest("tr[data-row]");
    if (!tr || e.ctrlKey || e.metaKey || e.altKey) return;
    const rows = rowsOf(body);
    const i = rows.indexOf(tr);
    const onRow = e.target === tr;
    // The suggestions shown, and the button that shows the rest.
    const buttons = [...tr.querySelectorAll("button.suggestion, button.sugg-more")].filter((b) => !b.closest("[hidden]"));
    const at = buttons.indexOf(e.target);
    let next = -1;
    switch (e.key) {
      case "ArrowDown":
        next = Math.min(i + 1, rows.length - 1);
        break;
      case "ArrowUp":
        next = Math.max(i - 1, 0);
        break;
      case "Home":
        if (onRow) next = 0;
        break;
      case "End":
        if (onRow) next = rows.length - 1;
        break;
      case "ArrowRight":
        if (buttons.length && at < buttons.length - 1) {
          e.preventDefault();
          buttons[at + 1].focus();
        }
        return;
      case "ArrowLeft":
        if (at > 0) {
          e.preventDefault();
          buttons[at - 1].focus();
        } else if (at === 0) {
          e.preventDefault();
          tr.focus();
        }
        return;
      case "Escape":
        if (!onRow) {
          e.preventDefault();
          tr.focus();
        }
        return;
      case "Enter":
        if (onRow && tr.querySelector("button.suggestion")) {
          e.preventDefault();
          apply(Number(tr.dataset.row), 0);
        }
        return;
      default:
        if (onRow && /^[1-9]$/.test(e.key) && tr.querySelector(`button.suggestion[data-sugg="${Number(e.key) - 1}"]`)) {
          e.preventDefault();
          apply(Number(tr.dataset.row), Number(e.key) - 1);
        }
        return;
    }
    if (next >= 0) {
      e.preventDefault();
      focusRow(body, next);
    }
  });
}
