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
