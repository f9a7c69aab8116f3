/**
 * A prose block on the page: Markdown tokens ({@link ./markdown.ts}) turned
 * into Preact nodes. Math is typeset by KaTeX as MathML (the browser draws
 * it; no fonts or style sheet to ship, and it prints). Inline values are
 * drawn by a callback so they follow their cell live.
 *
 * @module
 */
import { type ComponentChild, h } from "preact";
import katex from "katex";
import { headingId, parseProse, type ProseRef, type Token } from "./markdown.ts";

/** Draws one inline value. */
export type RefRenderer = (ref: ProseRef, key: number) => ComponentChild;

interface Frame {
  tag: string | null;
  attrs: Record<string, string>;
  children: ComponentChild[];
}

const mathCache = new Map<string, string>();

function mathml(tex: string, display: boolean): string {
  const key = (display ? "D" : "I") + tex;
  let html = mathCache.get(key);
  if (html === undefined) {
    html = katex.renderToString(tex, {
      displayMode: display,
      output: "mathml",
      throwOnError: false,
      strict: false,
      trust: false,
    });
    mathCache.set(key, html);
  }
  return html;
}

function attrsOf(t: Token, line: number): Record<string, string> {
  const a: Record<string, string> = {};
  for (const [k, v] of t.attrs ?? []) a[k] = v;
  if (t.type === "heading_open" && t.map) a.id = headingId(line + t.map[0]);
  if (t.type === "link_open") a.rel = "noopener noreferrer";
  return a;
}

function leaf(t: Token, key: number, refs: RefRenderer): ComponentChild {
  switch (t.type) {
    case "text":
      return t.content;
    case "softbreak":
      return "\n";
    case "hardbreak":
      return h("br", { key });
    case "code_inline":
      return h("code", { key }, t.content);
    case "math_inline":
    case "math_display":
      return h(t.type === "math_display" ? "div" : "span", {
        key,
        class: t.type === "math_display" ? "pl-math pl-math-display" : "pl-math",
        dangerouslySetInnerHTML: { __html: mathml(t.content, t.type === "math_display") },
      });
    case "plumb_ref":
      return refs(t.meta as ProseRef, key);
    case "image":
      return h("img", { key, src: t.attrGet("src") ?? "", alt: t.content, loading: "lazy" });
    case "fence":
    case "code_block":
      return h("pre", { key, class: "pl-prose-code" }, h("code", null, t.content));
    case "hr":
      return h("hr", { key });
    default:
      return t.content ? t.content : null;
  }
}

function build(tokens: Token[], line: number, refs: RefRenderer, into: Frame): void {
  const stack: Frame[] = [into];
  let key = 0;
  for (const t of tokens) {
    const top = stack[stack.length - 1];
    if (t.type === "inline") {
      build(t.children ?? [], line, refs, top);
    } else if (t.nesting === 1) {
      stack.push({ tag: t.hidden ? null : t.tag, attrs: attrsOf(t, line), children: [] });
    } else if (t.nesting === -1) {
      const f = stack.pop()!;
      const parent = stack[stack.length - 1];
      if (f.tag === null) parent.children.push(...f.children);
      else parent.children.push(h(f.tag, { key: key++, ...f.attrs }, f.children));
    } else {
      const v = leaf(t, key++, refs);
      if (v !== null && v !== undefined) top.children.push(v);
    }
  }
}

/**
 * Renders one prose block.
 *
 * @param props `text` (the Markdown), `line` (its first document line), `refs`.
 * @returns A `div` of the rendered prose.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { h } from "preact";
 * import { Prose } from "./prose.tsx";
 * const html = renderToString(h(Prose, { text: "# T\n\nSee @(a.b) and $x^2$. <b>x</b>", line: 1,
 *   refs: (r, key) => h("span", { key }, r.cell) }));
 * if (!html.includes("<math") || html.includes("<b>") || !html.includes('id="h-1"')) throw new Error(html);
 * ```
 */
export function Prose(props: { text: string; line: number; refs: RefRenderer }): ComponentChild {
  const root: Frame = { tag: "div", attrs: {}, children: [] };
  build(parseProse(props.text), props.line, props.refs, root);
  return h("div", { class: "pl-prose" }, root.children);
}
