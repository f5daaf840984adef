// The code card: a side panel that opens on any code of the findings or the
// search results (the worker's Checker.card, the CLI's `show`). It shows the
// way up to the chapter, the validity strip, the children in force with
// check boxes and counts, the siblings, the tabular list's notes (their codes
// open their own cards), successors and mappings. Keys: ArrowUp the parent,
// ArrowDown the first child, ArrowLeft/ArrowRight the siblings, Escape closes.
//
// The notes live in a file of their own, loaded the first time a card is
// opened: until then the card shows its other facts and says the notes are
// loading, then its notes section is drawn again with them.
//
// The page hands in: `ask(type, payload)` (a worker request), `loadNotes()`
// (the Checker's), `options()` (the check's day or period), `coverage()` ({from, to} of the index),
// `addCodes([{code, label}])` and `replaceLine(line, code)` (list edits that
// re-check the list). Built from DOM nodes only: descriptions are data.

import { stripSvg, stripWords, ensureDefs } from "./pictures.js";

const STATUS_WORDS = {
  billable: "billable",
  header: "header (not billable)",
  "not-in-use": "not in use",
  "in-use": "in use",
  obsolete: "obsolete",
  changes: "changes during the period",
  "code-start": "the start of several codes",
  unknown: "unknown",
  malformed: "not a code of this system",
  "other-system": "a code of another system",
};

const NOTE_WORDS = {
  includes: "Includes",
  "inclusion-term": "Inclusion term",
  excludes1: "Excludes1",
  excludes2: "Excludes2",
  "code-first": "Code first",
  "use-additional-code": "Use additional code",
  "code-also": "Code also",
  note: "Note",
  "seventh-character": "7th character",
};

const REASON_WORDS = {
  "first-release": () => "in force from the first release covered",
  "in-release": () => "in use in this release",
  "not-yet-added": () => "not yet in the classification",
  added: () => "added",
  subdivided: (c) => (c.length ? `subdivided into ${c.join(", ")}` : "subdivided"),
  merged: (c) => (c.length ? `its subdivisions ${c.join(", ")} were retired` : "its subdivisions were retired"),
  retired: (c) => (c.length ? `retired; successors ${c.join(", ")}` : "retired; no successor named"),
  obsolete: (c) => (c.length ? `obsolete; replaced by ${c.join(", ")}` : "obsolete"),
};

function el(tag, className, content) {
  const e = document.createElement(tag);
  if (className) e.className = className;
  if (content !== undefined) e.textContent = content;
  return e;
}

/** A button that opens the card of `code`. */
function codeLink(code, open, label) {
  const b = el("button", "card-link", label ?? code);
  b.type = "button";
  b.dataset.code = code;
  b.addEventListener("click", () => open(code));
  return b;
}

/** A note's text with the codes it names as links (the rest as text). */
function noteText(text, codes, open) {
  const span = el("span", "card-note-text");
  const wanted = new Set(codes);
  const re = /[A-Z][0-9][0-9A-Z](?:\.[0-9A-Z]*)?/g;
  let at = 0;
  for (const m of text.matchAll(re)) {
    const bare = m[0].replace(/\.$/, "");
    if (!wanted.has(bare)) continue;
    span.append(text.slice(at, m.index));
    span.append(codeLink(bare, open, m[0]));
    at = m.index + m[0].length;
  }
  span.append(text.slice(at));
  return span;
}

export function initCard({ ask, loadNotes, options, coverage, addCodes, replaceLine }) {
  ensureDefs();
  const panel = el("aside", "card-panel");
  panel.id = "card-panel";
  panel.hidden = true;
  panel.tabIndex = -1;
  panel.setAttribute("aria-label", "Code card");
  document.body.append(panel);
  let current = null; // { card, line }
  let asked = 0;
  // What had the focus before the card took it (the list, a button), given
  // it back on closing so the keyboard goes on from there.
  let opener = null;

  async function open(code, line = current ? current.line : null) {
    const mine = ++asked;
    if (!panel.contains(document.activeElement)) opener = document.activeElement;
    panel.hidden = false;
    panel.dataset.state = "loading";
    try {
      const card = await ask("card", { code, options: options() });
      if (mine !== asked) return;
      current = { card, line };
      render(card, line);
      panel.dataset.state = "ready";
      panel.dataset.code = card.code;
      panel.dataset.notes = card.notes_status;
      panel.focus();
      if (card.notes_status === "not-loaded") withNotes(mine, code, line);
    } catch (e) {
      if (mine !== asked) return;
      panel.replaceChildren(el("p", "card-error", `Could not open the card of ${code}: ${e.message.replace(/^Error: /, "")}`));
      panel.dataset.state = "error";
    }
  }

  /** Load the notes file, then draw the card again with its notes. */
  async function withNotes(mine, code, line) {
    try {
      if (!(await loadNotes())) return;
      if (mine !== asked) return;
      const card = await ask("card", { code, options: options() });
      if (mine !== asked) return;
      // Only the notes section is drawn again: the boxes ticked meanwhile stay.
      current = { card, line };
      const old = panel.querySelector(".card-notes-section");
      const fresh = notesSection(card);
      if (old && fresh) old.replaceWith(fresh);
      else if (old) old.remove();
      panel.dataset.notes = card.notes_status;
    } catch (e) {
      if (mine !== asked) return;
      const p = panel.querySelector(".card-notes-state");
      if (p) p.textContent = `The notes of the tabular list could not be loaded: ${e.message.replace(/^Error: /, "")}`;
      panel.dataset.notes = "error";
    }
  }

  function close() {
    const inside = panel.contains(document.activeElement);
    panel.hidden = true;
    current = null;
    if (inside && opener && opener.isConnected) opener.focus();
    opener = null;
  }

  function section(title, ...children) {
    const s = el("section", "card-section");
    s.append(el("h3", null, title), ...children);
    return s;
  }

  /** The notes section of a card (null when it has none to show). A code's
   * card says when the notes are still to come, rather than showing none. */
  function notesSection(card) {
    const unloaded = card.notes_status === "not-loaded" && !card.problem && card.status !== "code-start";
    if (!(card.notes.length || card.seventh_character || unloaded)) return null;
    const ul = el("ul", "card-list card-notes");
    for (const n of card.notes) {
      const li = el("li", `note-${n.kind}`);
      li.append(el("strong", null, `${NOTE_WORDS[n.kind] || n.kind}: `), noteText(n.text, n.codes, open));
      if (!(n.level === "code" && n.at === card.code)) li.append(el("span", "card-at", ` (at ${n.level} ${n.at})`));
      ul.append(li);
    }
    if (card.seventh_character) {
      const r = card.seventh_character;
      ul.append(el("li", "note-seventh", `7th character (at ${r.at}): ${r.extensions.map(([c, m]) => `${c} ${m}`).join("; ")}`));
    }
    const notes = section("Notes of the tabular list", ul);
    notes.classList.add("card-notes-section");
    if (unloaded) notes.insertBefore(el("p", "card-notes-state hint", "The notes of the tabular list are loading…"), ul);
    return notes;
  }

  function render(card, line) {
    const head = el("header", "card-head");
    const closeButton = el("button", "card-close", "Close");
    closeButton.type = "button";
    closeButton.setAttribute("aria-label", "Close the card");
    closeButton.addEventListener("click", close);
    head.append(closeButton);

    // Breadcrumb: chapter › section › ancestors › the code.
    const crumbs = el("nav", "card-crumbs");
    crumbs.setAttribute("aria-label", "Place in the classification");
    const parts = [];
    if (card.chapter) parts.push(el("span", "card-crumb", `Chapter ${card.chapter.code}: ${card.chapter.title}`));
    if (card.section) parts.push(el("span", "card-crumb", `${card.section.code} ${card.section.title}`));
    for (const a of card.ancestors) {
      const b = codeLink(a.code, open);
      b.title = a.description;
      parts.push(b);
    }
    parts.push(el("strong", "card-crumb", card.code));
    parts.forEach((p, i) => {
      if (i) crumbs.append(el("span", "card-sep", " › "));
      crumbs.append(p);
    });
    head.append(crumbs);
    head.append(el("h2", "card-title", `${card.code} ${card.description || ""}`.trim()));
    head.append(el("p", `card-status status-${card.status}`, STATUS_WORDS[card.status] || card.status));
    const out = [head];

    if (card.problem) {
      const p = section("Not a code of this index", el("p", null, card.problem.message));
      const ul = el("ul", "card-list");
      for (const s of card.problem.suggestions) {
        const li = el("li");
        li.append(codeLink(s.code, open), ` ${s.description} — ${s.reason}`);
        ul.append(li);
      }
      p.append(ul);
      out.push(p);
    }

    if (line && !card.problem && card.status !== "code-start") {
      const put = el("button", "card-put", `Put ${card.code} in place of line ${line}`);
      put.type = "button";
      put.addEventListener("click", () => replaceLine(line, card.code));
      out.push(put);
    }

    // The release's own wordings, as written (the HPO licence asks for content unaltered).
    if ((card.synonyms || []).length) {
      const ul = el("ul", "card-list card-synonyms");
      for (const w of card.synonyms) ul.append(el("li", null, w));
      out.push(section("Synonyms", ul));
    }

    if (card.timeline.length) {
      const spans = card.timeline
        .filter((t) => t.state === "billable" || t.state === "header" || t.state === "in-use")
        .map((t) => ({ kind: t.state === "header" ? "header" : "billable", from: t.from, to: t.to }));
      const o = options();
      const cov = coverage();
      const day = new Date().toISOString().slice(0, 10);
      const period = { from: o.from || o.on || day, to: o.to || o.on || day };
      const strip = el("div", "card-strip");
      // stripSvg is markup built from dates and numbers only.
      strip.innerHTML = stripSvg(spans, cov, period, 360);
      strip.append(el("p", "strip-words", stripWords(spans)));
      const ul = el("ul", "card-timeline");
      for (const t of card.timeline) {
        const why = (REASON_WORDS[t.reason] || (() => t.reason))(t.codes);
        ul.append(el("li", `card-span span-${t.state}`, `${t.from} to ${t.to}: ${t.state}, ${why}`));
      }
      out.push(section("Validity", strip, ul));
    }

    if (card.children.length) {
      const form = el("div", "card-children");
      const ul = el("ul", "card-list");
      for (const c of card.children) {
        const li = el("li");
        const box = el("input");
        box.type = "checkbox";
        box.value = c.code;
        box.dataset.description = c.description;
        box.setAttribute("aria-label", `Check ${c.code}`);
        const count = c.status === "billable" || c.status === "in-use"
          ? c.status
          : `${c.status}, ${c.billable_under} billable under it`;
        li.append(box, " ", codeLink(c.code, open), ` ${c.description} `, el("span", "card-count", `(${count})`));
        ul.append(li);
      }
      const add = el("button", "card-add", "Add the checked codes to the list");
      add.type = "button";
      add.addEventListener("click", () => {
        const picked = [...ul.querySelectorAll("input:checked")].map((b) => ({ code: b.value, label: b.dataset.description }));
        if (picked.length) addCodes(picked);
      });
      form.append(ul, add);
      out.push(section(`Children (${card.children.length})`, form));
    }

    if (card.siblings.length) {
      const ul = el("ul", "card-list card-siblings");
      for (const c of card.siblings) {
        const li = el("li");
        li.append(codeLink(c.code, open), ` ${c.description}`);
        ul.append(li);
      }
      out.push(section(`Siblings (${card.siblings.length})`, ul));
    }

    const notes = notesSection(card);
    if (notes) out.push(notes);

    for (const [title, links] of [["Successors", card.successors], ["Predecessors", card.predecessors], ["Consider", card.consider || []]]) {
      if (!links.length) continue;
      const ul = el("ul", "card-list");
      for (const l of links) {
        const li = el("li");
        li.append(codeLink(l.code, open), ` ${l.description}${l.effective ? ` (from ${l.effective})` : ""}`);
        ul.append(li);
      }
      out.push(section(title, ul));
    }
    if ((card.alternate_ids || []).length) out.push(section("Alternate ids", el("p", null, card.alternate_ids.join(", "))));
    if (card.mappings.length) {
      const ul = el("ul", "card-list");
      for (const m of card.mappings) {
        const dir = m.role === "source" ? `maps to ${m.system}` : `${m.system} code mapping to it`;
        ul.append(el("li", null, `${m.code} ${m.description} (${dir}${m.flags.approximate ? ", approximate" : ""})`));
      }
      out.push(section("General Equivalence Mappings", ul));
    }
    out.push(el("p", "hint", "A help for assembling research code lists, not coding or billing advice; official coding guidelines and local policy prevail."));
    panel.replaceChildren(...out);
  }

  // Keys: up to the parent, down to the first child, across the siblings.
  panel.addEventListener("keydown", (e) => {
    if (!current || e.target.tagName === "INPUT") return;
    const card = current.card;
    let to = null;
    if (e.key === "Escape") {
      close();
      return;
    } else if (e.key === "ArrowUp") {
      to = card.ancestors.length ? card.ancestors[card.ancestors.length - 1].code : null;
    } else if (e.key === "ArrowDown") {
      to = card.children.length ? card.children[0].code : null;
    } else if (e.key === "ArrowLeft" || e.key === "ArrowRight") {
      const row = [...card.siblings.map((s) => s.code), card.code].sort();
      const i = row.indexOf(card.code) + (e.key === "ArrowLeft" ? -1 : 1);
      to = i >= 0 && i < row.length && row.length > 1 ? row[i] : null;
    } else {
      return;
    }
    e.preventDefault();
    if (to) open(to);
  });

  // Any code in the findings or the search results opens its card.
  document.addEventListener("click", (e) => {
    const target = e.target.closest("#findings td.input code, #search-results .search-code");
    if (!target) return;
    const tr = target.closest("tr[data-line]");
    const line = tr ? Number(tr.dataset.line) || null : null;
    const code = target.textContent.split(",")[0].trim();
    if (code) open(code, line);
  });

  return { open, close };
}
