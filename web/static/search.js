// The word search box: codes whose official wording fits the words typed,
// suggested as you type (the worker's Checker.find), each with its status
// on the index's default day (today when the index covers it), the days it was billable, and a button that adds it to the list.
//
// The page hands in two functions: `ask(type, payload)` (a worker request)
// and `addToList(code, description)`.

const $ = (id) => document.getElementById(id);

function text(tag, className, content) {
  const el = document.createElement(tag);
  if (className) el.className = className;
  el.textContent = content;
  return el;
}

/** A result's status in words, on the day the search judged it (`when`: "today" or "on DATE"). */
function statusWords(status, when) {
  return (
    {
      billable: `billable ${when}`,
      header: `header ${when} (not billable)`,
      "not-in-use": `not in use ${when}`,
      "in-use": "in use in this release",
      retired: "obsolete in this release",
    }[status] || status
  );
}

/** Fill the results list (built with DOM nodes: descriptions are data, not markup). */
function show(list, status, query, found, addToList) {
  list.replaceChildren();
  if (!query.trim()) {
    status.textContent = "";
    return;
  }
  if (found.no_code) {
    status.textContent = `No code starts with ${found.no_code}.`;
    return;
  }
  if (!found.results.length) {
    status.textContent = `No code fits “${query}”.`;
    return;
  }
  const n = found.results.length;
  status.textContent = `${n} code${n === 1 ? "" : "s"} for “${query}”, best first.`;
  const today = new Date().toISOString().slice(0, 10);
  const when = !found.date || found.date === today ? "today" : `on ${found.date}`;
  for (const r of found.results) {
    const li = document.createElement("li");
    li.className = "search-result";
    li.append(text("code", "search-code", r.code), " ");
    li.append(text("span", "search-desc", r.description), " ");
    li.append(text("span", `search-status status-${r.status}`, statusWords(r.status, when)), " ");
    const span = r.status === "in-use" || r.status === "retired"
      ? (r.billable_from === r.billable_to && r.billable_from ? `release ${r.billable_from}` : "")
      : r.billable_from
        ? `billable ${r.billable_from} to ${r.billable_to}`
        : "never billable (a header only)";
    li.append(text("span", "search-dates", span), " ");
    // The visible words are the button's whole name (no hidden label to disagree with them).
    const add = text("button", "search-add", `Add ${r.code} to the list`);
    add.type = "button";
    add.addEventListener("click", () => addToList(r.code, r.description));
    li.append(add);
    list.append(li);
  }
}

/** Wire the search box (a no-op if the page has none). */
export function initSearch({ ask, addToList }) {
  const input = $("word-search");
  const list = $("search-results");
  const status = $("search-status");
  if (!input || !list || !status) return;
  let timer = 0;
  let asked = 0;
  const run = async () => {
    const query = input.value;
    const mine = ++asked;
    if (!query.trim()) {
      show(list, status, "", { results: [] }, addToList);
      return;
    }
    try {
      const found = await ask("find", { query, limit: 10 });
      if (mine === asked) show(list, status, query, found, addToList);
    } catch (e) {
      if (mine === asked) status.textContent = `Search failed: ${e.message}`;
    }
  };
  input.addEventListener("input", () => {
    clearTimeout(timer);
    timer = setTimeout(run, 120);
  });
  input.addEventListener("keydown", (e) => {
    if (e.key === "Enter") {
      e.preventDefault();
      clearTimeout(timer);
      run();
    }
  });
}
