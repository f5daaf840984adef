// What changed between the list as pasted (or read from a file, a link or
// the demo) and the list now: a line diff, shown as removed and added lines
// with their line numbers. Built from text nodes only.

const DIFF_CELLS = 4_000_000; // lines before x lines after, beyond which only counts are given
const SHOWN = 200;

/**
 * Line operations turning `a` into `b`: [{op: "same"|"del"|"add", text,
 * a?: line in a, b?: line in b}], or null when the changed middle is too
 * large to align (then only the counts are known).
 */
export function diffLines(aText, bText) {
  const a = aText.split("\n");
  const b = bText.split("\n");
  let start = 0;
  while (start < a.length && start < b.length && a[start] === b[start]) start++;
  let endA = a.length;
  let endB = b.length;
  while (endA > start && endB > start && a[endA - 1] === b[endB - 1]) {
    endA--;
    endB--;
  }
  const midA = a.slice(start, endA);
  const midB = b.slice(start, endB);
  if (midA.length * midB.length > DIFF_CELLS) return null;
  // Longest common subsequence over the changed middle.
  const n = midA.length;
  const m = midB.length;
  const lcs = Array.from({ length: n + 1 }, () => new Uint32Array(m + 1));
  for (let i = n - 1; i >= 0; i--) {
    for (let j = m - 1; j >= 0; j--) {
      lcs[i][j] = midA[i] === midB[j] ? lcs[i + 1][j + 1] + 1 : Math.max(lcs[i + 1][j], lcs[i][j + 1]);
    }
  }
  const ops = [];
  let i = 0;
  let j = 0;
  while (i < n || j < m) {
    if (i < n && j < m && midA[i] === midB[j]) {
      ops.push({ op: "same", text: midA[i], a: start + i + 1, b: start + j + 1 });
      i++;
      j++;
    } else if (i < n && (j === m || lcs[i + 1][j] >= lcs[i][j + 1])) {
      // A line taken out is shown before the line put in its place.
      ops.push({ op: "del", text: midA[i], a: start + i + 1 });
      i++;
    } else {
      ops.push({ op: "add", text: midB[j], b: start + j + 1 });
      j++;
    }
  }
  return ops;
}

function plural(n, word) {
  return `${n.toLocaleString("en-US")} ${word}${n === 1 ? "" : "s"}`;
}

function line(cls, sign, number, text) {
  const li = document.createElement("li");
  li.className = cls;
  const mark = document.createElement("span");
  mark.className = "chg-sign";
  mark.textContent = sign;
  const num = document.createElement("span");
  num.className = "chg-line";
  num.textContent = number;
  const code = document.createElement("code");
  code.textContent = text === "" ? "(empty line)" : text;
  li.append(mark, " ", num, " ", code);
  return li;
}

/** Show the changes from `original` to `now` in `box` (a summary <p> and a <ul>). */
export function renderChanges(box, original, now) {
  const summary = box.querySelector(".chg-summary");
  const list = box.querySelector(".chg-list");
  list.replaceChildren();
  if (original === null || original === now) {
    summary.textContent = original === null ? "No list pasted yet." : "No changes: the list is as it was pasted.";
    box.dataset.changes = "0";
    return;
  }
  const ops = diffLines(original, now);
  if (!ops) {
    summary.textContent = "The list has changed in too many places to show line by line.";
    box.dataset.changes = "many";
    return;
  }
  const removed = ops.filter((o) => o.op === "del");
  const added = ops.filter((o) => o.op === "add");
  summary.textContent = `Since the list was pasted: ${plural(removed.length, "line")} taken out, ${plural(added.length, "line")} put in.`;
  box.dataset.changes = String(removed.length + added.length);
  let shown = 0;
  for (const o of ops) {
    if (o.op === "same") continue;
    if (shown++ >= SHOWN) {
      const li = document.createElement("li");
      li.className = "hint";
      li.textContent = `… and ${removed.length + added.length - SHOWN} more.`;
      list.append(li);
      break;
    }
    list.append(
      o.op === "del"
        ? line("chg-del", "−", `was line ${o.a}:`, o.text)
        : line("chg-add", "+", `now line ${o.b}:`, o.text),
    );
  }
}
