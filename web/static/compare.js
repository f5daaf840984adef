// The compare view: a second list (B) beside the page's list (A), checked
// with the same options and compared by the billable codes each reaches in
// the period. Everything from the lists reaches the page as text nodes.

const SVG = "http://www.w3.org/2000/svg";
const RUN_CODES_SHOWN = 6;

function el(tag, attrs = {}, ...children) {
  const n = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) n.setAttribute(k, v);
  for (const c of children) n.append(c);
  return n;
}

function svgEl(tag, attrs) {
  const n = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs)) n.setAttribute(k, String(v));
  return n;
}

function plural(n, word) {
  return `${n.toLocaleString("en-US")} ${word}${n === 1 ? "" : "s"}`;
}

function pct(x) {
  return `${(x * 100).toFixed(1)}%`;
}

/** One bar per chapter: in both, only in A, only in B, side by side, on one scale. */
function chapterBar(t, scale) {
  const w = 260;
  const h = 14;
  const svg = svgEl("svg", { class: "cmp-bar", width: w, height: h, viewBox: `0 0 ${w} ${h}`, "aria-hidden": "true" });
  svg.append(svgEl("rect", { x: 0.5, y: 0.5, width: w - 1, height: h - 1, class: "fill-absent" }));
  let x = 0;
  for (const [n, cls] of [
    [t.both, "fill-both"],
    [t.only_a, "fill-only-a"],
    [t.only_b, "fill-only-b"],
  ]) {
    const width = (n / scale) * w;
    if (width > 0) svg.append(svgEl("rect", { x: x.toFixed(1), y: 0, width: Math.max(width, 1).toFixed(1), height: h, class: cls }));
    x += width;
  }
  return svg;
}

function chapterRows(c) {
  const box = el("div", { class: "cmp-chapters" });
  const scale = Math.max(1, ...c.chapters.map((t) => t.both + t.only_a + t.only_b));
  for (const t of c.chapters) {
    const words = `in both ${t.both}, only in A ${t.only_a}, only in B ${t.only_b}`;
    const row = el("div", { class: "cmp-row", role: "group", "aria-label": `Chapter ${t.chapter}: ${words}` });
    row.append(
      el("span", { class: "cmp-chapter" }, t.chapter ? `${t.chapter}. ${t.title}` : t.title),
      chapterBar(t, scale),
      el("span", { class: "cmp-words" }, words),
    );
    box.append(row);
  }
  return box;
}

function codeLine(code, text) {
  return el("span", {}, el("code", {}, code), " ", text);
}

function runItem(d) {
  const li = el("li", { class: `cmp-run side-${d.side}` });
  if (d.all_of) {
    li.append(codeLine(d.code, `all ${plural(d.codes.length, "billable code")} under it: ${d.description}`));
    const shown = d.codes.slice(0, RUN_CODES_SHOWN).map((n) => n.code).join(", ");
    const more = d.codes.length - RUN_CODES_SHOWN;
    li.append(el("span", { class: "cmp-codes" }, more > 0 ? `${shown} and ${more} more` : shown));
  } else {
    li.append(codeLine(d.code, d.description));
  }
  const other = d.side === "a" ? "B" : "A";
  const n = d.nearest;
  li.append(
    el(
      "span",
      { class: "cmp-nearest" },
      n ? `nearest in ${other}: ${n.code} (${n.relation}) ${n.description}` : `${other} has nothing in category ${d.category}`,
    ),
  );
  return li;
}

function differenceList(c, side) {
  const runs = c.differences.filter((d) => d.side === side);
  const codes = runs.reduce((s, d) => s + d.codes.length, 0);
  const box = el("div", { class: "cmp-side", "data-side": side });
  box.append(el("h4", {}, `Only in ${side.toUpperCase()}: ${plural(codes, "code")} in ${plural(runs.length, "run")}`));
  if (!runs.length) return box;
  const list = el("ul", { class: "cmp-runs" });
  for (let k = 0; k < runs.length; ) {
    const d = runs[k];
    let j = k;
    const same = (r) => JSON.stringify(r.within) === JSON.stringify(d.within);
    while (j < runs.length && same(runs[j])) j++;
    if (d.within && j - k >= 2) {
      const group = el("li", { class: "cmp-group" });
      group.append(codeLine(d.within.code, `${d.within_only} of its ${d.within_total} billable codes: ${d.within.description}`));
      const inner = el("ul", { class: "cmp-runs" });
      for (const r of runs.slice(k, j)) inner.append(runItem(r));
      group.append(inner);
      list.append(group);
    } else {
      for (const r of runs.slice(k, j)) list.append(runItem(r));
    }
    k = j;
  }
  box.append(list);
  return box;
}

function lineWords(lines) {
  return lines.length === 1 ? `line ${lines[0]}` : `lines ${lines.join(", ")}`;
}

function render(c, out) {
  out.replaceChildren();
  const g = c.agreement;
  const headline = el(
    "p",
    { class: "summary", id: "compare-summary" },
    `${g.only_a === 0 && g.only_b === 0 ? "Both lists reach the same billable codes." : "The lists differ."} ` +
      `In both ${g.both}, only in A ${g.only_a}, only in B ${g.only_b}; Jaccard index ${g.jaccard.toFixed(3)}. ` +
      `B reaches ${pct(g.a_in_b)} of A's codes; A reaches ${pct(g.b_in_a)} of B's.`,
  );
  const checks = el(
    "p",
    { class: "hint" },
    `Checks: A has ${plural(c.a.summary.errors, "error")} and ${plural(c.a.summary.warnings, "warning")} ` +
      `(${plural(c.a.reaches, "billable code")} reached); B has ${plural(c.b.summary.errors, "error")} and ` +
      `${plural(c.b.summary.warnings, "warning")} (${plural(c.b.reaches, "billable code")} reached). ` +
      `Check each list on its own for the details.`,
  );
  out.append(headline, checks);
  if (c.chapters.length) {
    out.append(el("h3", {}, "By chapter"), legend(), chapterRows(c));
  }
  out.append(el("h3", {}, "Differences"));
  const sides = el("div", { class: "cmp-sides" });
  sides.append(differenceList(c, "a"), differenceList(c, "b"));
  out.append(sides);
  if (c.equivalents.length) {
    out.append(el("h3", {}, "Written differently, same codes"));
    const ul = el("ul", { class: "cmp-equivalents" });
    for (const e of c.equivalents) {
      ul.append(
        el(
          "li",
          {},
          `A ${lineWords(e.a_lines)} ${e.a_entries.join(", ")} = B ${lineWords(e.b_lines)} ${e.b_entries.join(", ")} (${plural(e.codes, "billable code")})`,
        ),
      );
    }
    out.append(ul);
  }
}

function legend() {
  const key = (cls, words) => {
    const svg = svgEl("svg", { width: 22, height: 12, "aria-hidden": "true" });
    svg.append(svgEl("rect", { width: 22, height: 12, class: cls }));
    return el("span", { class: "key" }, svg, ` ${words}`);
  };
  return el(
    "div",
    { class: "legend", id: "compare-legend" },
    el("strong", {}, "Legend:"),
    key("fill-both", "in both lists"),
    key("fill-only-a", "only in A (your list above)"),
    key("fill-only-b", "only in B"),
    el("span", { class: "hint" }, " Bars share one scale; the numbers are written beside each."),
  );
}

/**
 * Wires the compare panel. `ask(type, payload)` talks to the worker;
 * `options()` gives the check options of the page (null while they are
 * being typed); `listA()` the page's list; `ready()` whether the index is
 * loaded; `onCompared()` is told after each comparison (the page keeps
 * list B in its link). Once B holds a list, a change to either list
 * compares again.
 */
export function setupCompare({ ask, options, listA, ready, onCompared = () => {} }) {
  const $ = (id) => document.getElementById(id);
  const button = $("compare-now");
  const status = $("compare-status");
  const out = $("compare-result");
  const listB = $("list-b");
  let seq = 0;
  let timer = 0;
  async function run() {
    clearTimeout(timer);
    if (!ready()) return;
    const opts = options();
    if (!opts) {
      status.textContent = "Waiting for both days of the study period.";
      return;
    }
    const mine = ++seq;
    status.textContent = "Comparing…";
    document.body.dataset.comparing = "true";
    try {
      const { comparison, ms } = await ask("compare", { a: listA(), b: listB.value, options: opts });
      if (mine !== seq) return;
      render(comparison, out);
      out.hidden = false;
      status.textContent = `Compared in ${ms.toFixed(0)} ms.`;
    } catch (e) {
      if (mine !== seq) return;
      out.hidden = false;
      out.replaceChildren(el("p", { class: "problem", role: "alert" }, `Could not compare: ${e.message.replace(/^Error: /, "")}`));
      status.textContent = "";
    } finally {
      if (mine === seq) {
        document.body.dataset.comparing = "false";
        document.body.dataset.compared = String(mine);
        onCompared();
      }
    }
  }
  /** Compare again soon, when B holds a list. */
  function changed() {
    clearTimeout(timer);
    if (!listB.value.trim()) return;
    timer = setTimeout(run, 400);
  }
  button.addEventListener("click", run);
  listB.addEventListener("input", changed);
  return {
    enable() {
      button.disabled = false;
    },
    /** List A or the options changed (its check is done): compare again when B holds a list. */
    listAChanged: changed,
    /** Put a list in B (from a link) and compare it. */
    setB(text) {
      listB.value = text;
      changed();
    },
    listB: () => listB.value,
  };
}
