/**
 * Putting Plot's panels into one SVG: a title line, a note line, then the
 * panels stacked, each a nested `<svg>` at its offset.
 *
 * @module
 */

const SVG_NS = "http://www.w3.org/2000/svg";

/** One drawn panel: Plot's root element (an `<svg>`). */
export type Panel = SVGSVGElement | HTMLElement;

/** Text lines over the panels. */
export interface Heading {
  title?: string | null;
  note?: string | null;
  /** The accessible name of the whole chart. */
  label: string;
}

/**
 * Stacks panels under an optional title and note into one SVG element (its
 * `outerHTML` is the markup the static record inlines; the live page inserts
 * the element itself, with no markup round trip).
 *
 * @param document The DOM document the panels were made with.
 * @param panels Plot's roots, top to bottom.
 * @param width Width of every panel, px.
 * @param heading Title, note and accessible name.
 * @returns The SVG element, with `xmlns` so its markup also stands alone as a file.
 */
export function stackPanels(
  document: Document,
  panels: Panel[],
  width: number,
  heading: Heading,
): SVGSVGElement {
  const root = document.createElementNS(SVG_NS, "svg");
  let y = 0;
  const line = (text: string, size: number, weight: string) => {
    const t = document.createElementNS(SVG_NS, "text");
    y += size + 6;
    t.setAttribute("x", "8");
    t.setAttribute("y", String(y - 4));
    t.setAttribute("font-size", String(size));
    t.setAttribute("font-weight", weight);
    t.textContent = text;
    root.appendChild(t);
  };
  if (heading.title) line(heading.title, 14, "600");
  if (heading.note) line(heading.note, 10, "400");
  for (const p of panels) {
    const h = Number(p.getAttribute("height"));
    p.setAttribute("y", String(y));
    root.appendChild(p);
    y += h;
  }
  root.setAttribute("xmlns", SVG_NS);
  root.setAttribute("width", String(width));
  root.setAttribute("height", String(y));
  root.setAttribute("viewBox", `0 0 ${width} ${y}`);
  root.setAttribute("font-family", "system-ui, sans-serif");
  root.setAttribute("role", "img");
  root.setAttribute("aria-label", heading.label);
  root.setAttribute("class", "plumb-chart");
  return root;
}

/** One cell of a {@link gridPanels} figure: a panel under its own title and note. */
export interface GridCell {
  panel: Panel;
  /** The question the panel answers. */
  title: string;
  /** What the check found on that question, in words (optional). */
  note?: string | null;
  /** True when the note states a finding (drawn in `flagColor`). */
  flagged?: boolean;
}

/**
 * Lays panels out in a grid, each under its title and note, under the
 * figure's heading: the check's residual figure.
 *
 * @param document The DOM document the panels were made with.
 * @param cells The panels, row by row.
 * @param columns Panels per row.
 * @param cellWidth Width of each panel, px.
 * @param heading Title, note and accessible name of the whole figure.
 * @param flagColor Colour of a note that states a finding.
 * @returns The SVG element.
 */
export function gridPanels(
  document: Document,
  cells: GridCell[],
  columns: number,
  cellWidth: number,
  heading: Heading,
  flagColor: string,
): SVGSVGElement {
  const head = stackPanels(document, [], cellWidth * columns, heading);
  let y = Number(head.getAttribute("height"));
  for (let i = 0; i < cells.length; i += columns) {
    const row = cells.slice(i, i + columns);
    let tallest = 0;
    row.forEach((c, k) => {
      const g = document.createElementNS(SVG_NS, "svg");
      g.setAttribute("x", String(k * cellWidth));
      g.setAttribute("y", String(y));
      const title = text(document, c.title, 12, "600", 8, 14);
      g.appendChild(title);
      let top = 20;
      if (c.note) {
        const note = text(document, c.note, 10, "400", 8, 32);
        if (c.flagged) note.setAttribute("fill", flagColor);
        g.appendChild(note);
        top = 38;
      }
      c.panel.setAttribute("y", String(top));
      g.appendChild(c.panel);
      const h = top + Number(c.panel.getAttribute("height"));
      g.setAttribute("width", String(cellWidth));
      g.setAttribute("height", String(h));
      g.setAttribute("role", "group");
      g.setAttribute("aria-label", c.title);
      head.appendChild(g);
      tallest = Math.max(tallest, h);
    });
    y += tallest + 8;
  }
  head.setAttribute("height", String(y));
  head.setAttribute("viewBox", `0 0 ${cellWidth * columns} ${y}`);
  return head;
}

function text(
  document: Document,
  content: string,
  size: number,
  weight: string,
  x: number,
  y: number,
): SVGTextElement {
  const t = document.createElementNS(SVG_NS, "text");
  t.setAttribute("x", String(x));
  t.setAttribute("y", String(y));
  t.setAttribute("font-size", String(size));
  t.setAttribute("font-weight", weight);
  t.textContent = content;
  return t as SVGTextElement;
}
