// Sortable tables: each column heading of a table marked data-sortable becomes a button.
// Cells may carry data-sort (a number or ISO date) to sort by instead of their text.

function cellKey(row, index) {
  const cell = row.cells[index];
  if (!cell) return "";
  return cell.hasAttribute("data-sort") ? cell.getAttribute("data-sort") : cell.textContent.trim();
}

function compareKeys(a, b, numeric) {
  // Empty keys (missing values) always sort last.
  if (a === "" && b === "") return 0;
  if (a === "") return 1;
  if (b === "") return -1;
  if (numeric) {
    const na = Number(a);
    const nb = Number(b);
    if (Number.isFinite(na) && Number.isFinite(nb)) return na - nb;
  }
  return a.localeCompare(b, "en", { numeric: true, sensitivity: "base" });
}

function sortBy(table, index, th) {
  const body = table.tBodies[0];
  if (!body) return;
  const numeric = th.classList.contains("num");
  const ascending = th.getAttribute("aria-sort") !== "ascending";
  const rows = Array.from(body.rows).map((row, i) => ({ row, i, key: cellKey(row, index) }));
  rows.sort((x, y) => {
    if (x.key === "" || y.key === "") return compareKeys(x.key, y.key, numeric) || x.i - y.i;
    const c = compareKeys(x.key, y.key, numeric);
    return (ascending ? c : -c) || x.i - y.i;
  });
  for (const other of table.tHead.rows[0].cells) other.removeAttribute("aria-sort");
  th.setAttribute("aria-sort", ascending ? "ascending" : "descending");
  for (const r of rows) body.appendChild(r.row);
}

/** Adds sort buttons to the column headings of every `table[data-sortable]` under `root`. */
export function makeTablesSortable(root) {
  for (const table of root.querySelectorAll("table[data-sortable]")) {
    if (!table.tHead || table.tBodies.length === 0 || table.tBodies[0].rows.length < 2) continue;
    Array.from(table.tHead.rows[0].cells).forEach((th, index) => {
      const button = document.createElement("button");
      button.type = "button";
      button.className = "sort";
      button.textContent = th.textContent;
      th.textContent = "";
      th.appendChild(button);
      button.addEventListener("click", () => sortBy(table, index, th));
    });
  }
}
