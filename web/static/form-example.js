// The example form sends to itself (method GET): show what a data request
// desk would receive, the list and the checker's summary field among it.
const params = new URLSearchParams(location.search);
if ([...params.keys()].length) {
  const dl = document.getElementById("received-fields");
  for (const [name, value] of params) {
    const dt = document.createElement("dt");
    dt.textContent = name;
    const dd = document.createElement("dd");
    dd.textContent = value;
    dd.dataset.field = name;
    dl.append(dt, dd);
  }
  document.getElementById("received").hidden = false;
}
