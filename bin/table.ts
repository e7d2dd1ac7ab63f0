/**
 * Plain-text tables for the command-line checker: every column as wide as its widest cell, two spaces
 * between columns, so no value (such as the finding kind `effort-over`) runs into the next column.
 *
 * @module
 */

/** How a column's cells are aligned: text to the left, numbers to the right. */
export type Align = "left" | "right";

/** Space between two columns. */
const GAP = "  ";

/**
 * Lines of a table (`rows[0]` is usually the header), each starting with `indent`. The last column is
 * not padded, so a long message ends the line without trailing spaces.
 */
export function formatTable(rows: readonly (readonly string[])[], align: readonly Align[] = [], indent = ""): string[] {
  const columns = rows.reduce((n, row) => Math.max(n, row.length), 0);
  const widths = Array.from({ length: columns }, (_, c) =>
    rows.reduce((w, row) => Math.max(w, [...(row[c] ?? "")].length), 0),
  );
  return rows.map((row) => {
    const cells = row.map((cell, c) => {
      const last = c === row.length - 1;
      const fill = " ".repeat(widths[c] - [...cell].length);
      if (align[c] === "right") return fill + cell;
      return last ? cell : cell + fill;
    });
    return indent + cells.join(GAP);
  });
}
