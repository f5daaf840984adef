// Small pictures: a validity strip per code across the years the index
// covers, and a coverage bar per category. Each has its meaning in words too
// (a text line and an accessible label), never only in colour.

const SVG = "http://www.w3.org/2000/svg";

export function esc(s) {
  return String(s ?? "").replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]);
}

/** Days since 1970-01-01 for a "YYYY-MM-DD" string. */
export function dayNumber(iso) {
  const [y, m, d] = iso.split("-").map(Number);
  return Math.floor(Date.UTC(y, m - 1, d) / 86400000);
}

/** A hidden <svg> holding the hatch pattern the header segments use. */
export function ensureDefs() {
  if (document.getElementById("rc-defs")) return;
  const svg = document.createElementNS(SVG, "svg");
  svg.setAttribute("id", "rc-defs");
  svg.setAttribute("width", "0");
  svg.setAttribute("height", "0");
  svg.setAttribute("aria-hidden", "true");
  svg.setAttribute("class", "defs");
  svg.innerHTML =
    '<defs><pattern id="rc-hatch" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">' +
    '<rect width="6" height="6" class="hatch-bg"/><line x1="0" y1="0" x2="0" y2="6" class="hatch-line"/></pattern></defs>';
  document.body.appendChild(svg);
}

/**
 * SVG markup of one code's strip. spans: [{kind, from, to}] or null (unknown);
 * coverage: {from, to} of the index; period: {from, to} of the check.
 */
export function stripSvg(spans, coverage, period, width = 420) {
  const h = 16;
  const top = 4;
  const a = dayNumber(coverage.from);
  const b = dayNumber(coverage.to) + 1;
  const x = (iso, end = false) => {
    const d = Math.min(Math.max(dayNumber(iso) + (end ? 1 : 0), a), b);
    return ((d - a) / (b - a)) * width;
  };
  let out = `<svg class="strip" width="${width}" height="${h + top + 16}" viewBox="0 0 ${width} ${h + top + 16}" aria-hidden="true">`;
  out += `<rect x="0.5" y="${top + 0.5}" width="${width - 1}" height="${h - 1}" class="fill-absent"/>`;
  for (const s of spans || []) {
    const x0 = x(s.from);
    const x1 = x(s.to, true);
    if (x1 <= x0) continue;
    const cls = s.kind === "billable" ? "fill-billable" : "fill-header";
    out += `<rect x="${x0.toFixed(1)}" y="${top}" width="${(x1 - x0).toFixed(1)}" height="${h}" class="${cls}"/>`;
  }
  // Year ticks.
  const y0 = Number(coverage.from.slice(0, 4));
  const y1 = Number(coverage.to.slice(0, 4));
  for (let y = y0 + 1; y <= y1; y++) {
    const tx = x(`${y}-01-01`);
    out += `<line x1="${tx.toFixed(1)}" y1="${top + h}" x2="${tx.toFixed(1)}" y2="${top + h + 3}" class="tick"/>`;
    if (((y - y0) % 2 === 1 || y1 - y0 <= 6) && tx > 12 && tx < width - 12) out += `<text x="${tx.toFixed(1)}" y="${top + h + 13}" class="tick-label">${y}</text>`;
  }
  // The study period (or the single day): a bold frame with marks above.
  const p0 = x(period.from);
  const p1 = Math.max(x(period.to, true), p0 + 2);
  out += `<rect x="${p0.toFixed(1)}" y="${top - 2}" width="${(p1 - p0).toFixed(1)}" height="${h + 4}" class="period-mark"/>`;
  out += `<path d="M${p0.toFixed(1)} 0 l4 0 l-4 4 z M${p1.toFixed(1)} 0 l-4 0 l4 4 z" class="period-tip"/>`;
  out += "</svg>";
  return out;
}

/** The same strip in words. */
export function stripWords(spans) {
  if (!spans) return "not in the index";
  if (!spans.length) return "never valid in the covered years";
  return spans.map((s) => `${s.kind} ${s.from} to ${s.to}`).join("; ");
}

/** Markup of one category's coverage bar. */
export function coverageRow(c, unit = "billable codes") {
  const w = 220;
  const frac = c.total ? c.included / c.total : 0;
  const pct = Math.round(frac * 100);
  const words = c.total
    ? `${c.included} of ${c.total} ${unit}${c.included === c.total ? " (all)" : ` (${pct}%)`}`
    : `no ${unit} in the period`;
  return (
    `<div class="cov-row" role="group" aria-label="${esc(c.category)}: ${esc(words)}">` +
    `<span class="cov-cat"><code>${esc(c.category)}</code> ${esc(c.description)}</span>` +
    `<svg class="cov-bar" width="${w}" height="14" viewBox="0 0 ${w} 14" aria-hidden="true">` +
    `<rect x="0.5" y="0.5" width="${w - 1}" height="13" class="fill-absent"/>` +
    `<rect x="0" y="0" width="${(frac * w).toFixed(1)}" height="14" class="fill-billable"/></svg>` +
    `<span class="cov-words">${esc(words)}</span></div>`
  );
}
