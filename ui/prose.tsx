/**
 * A prose block on the page: Markdown tokens ({@link ./markdown.ts}) turned
 * into Preact nodes. Math is typeset by KaTeX as MathML (the browser draws
 * it; no fonts or style sheet to ship, and it prints). Inline values are
 * drawn by a callback so they follow their cell live.
 *
 * Prose is untrusted, and one block never takes the page down: a block the
 * Markdown reader refuses ({@link ProseError}: nested too deep) or that
 * throws while it is built or drawn shows its source and the reason in
 * words ({@link ProseFailed}); math nested deeper than {@link MAX_TEX_NESTING}
 * braces or that the typesetter cannot handle shows its TeX and the reason
 * at that spot, the rest of the block drawn as usual.
 *
 * @module
 */
import { Component, type ComponentChild, h } from "preact";
import katex from "katex";
import { headingId, parseProse, ProseError, type ProseRef, type Token } from "./markdown.ts";

/** Draws one inline value. */
export type RefRenderer = (ref: ProseRef, key: number) => ComponentChild;

interface Frame {
  tag: string | null;
  attrs: Record<string, string>;
  children: ComponentChild[];
}

/** The deepest brace nesting typeset (KaTeX parses groups recursively: 3,000 `{` overflow its stack). */
export const MAX_TEX_NESTING = 50;

/** Markup of typeset math, or why it was not typeset. */
type Typeset = { html: string } | { why: string };

const mathCache = new Map<string, Typeset>();

/** The deepest nesting of `{` in TeX, escaped braces not counted. */
function braceDepth(tex: string): number {
  let depth = 0, deepest = 0;
  for (let i = 0; i < tex.length; i++) {
    const c = tex[i];
    if (c === "\\") i++;
    else if (c === "{") deepest = Math.max(deepest, ++depth);
    else if (c === "}") depth = Math.max(0, depth - 1);
  }
  return deepest;
}

function typeset(tex: string, display: boolean): Typeset {
  const depth = braceDepth(tex);
  if (depth > MAX_TEX_NESTING) {
    return {
      why: `its braces nest ${depth.toLocaleString("en")} deep (at most ${MAX_TEX_NESTING})`,
    };
  }
  try {
    return {
      html: katex.renderToString(tex, {
        displayMode: display,
        output: "mathml",
        throwOnError: false,
        strict: false,
        trust: false,
      }),
    };
  } catch (e) {
    return { why: e instanceof RangeError ? "it nests too deeply" : "the typesetter failed on it" };
  }
}

function mathml(tex: string, display: boolean): Typeset {
  const key = (display ? "D" : "I") + tex;
  let out = mathCache.get(key);
  if (out === undefined) {
    out = typeset(tex, display);
    if (mathCache.size > 500) mathCache.clear();
    mathCache.set(key, out);
  }
  return out;
}

function math(t: Token, key: number): ComponentChild {
  const display = t.type === "math_display";
  const out = mathml(t.content, display);
  if ("why" in out) {
    return h("span", { key, class: "pl-math-error" }, [
      h("code", null, display ? `$$${t.content}$$` : `$${t.content}$`),
      " ",
      h("em", { class: "pl-math-why" }, `(math not drawn: ${out.why})`),
    ]);
  }
  return h(display ? "div" : "span", {
    key,
    class: display ? "pl-math pl-math-display" : "pl-math",
    dangerouslySetInnerHTML: { __html: out.html },
  });
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
      return math(t, key);
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
 * The reason a prose block could not be drawn, in words: a {@link ProseError}
 * says its own; anything else (an internal error) is never shown as is.
 *
 * @param e What was thrown.
 * @returns The words after "This prose could not be drawn: ".
 */
export function proseFailure(e: unknown): string {
  if (e instanceof ProseError) return e.message;
  return e instanceof RangeError
    ? "it nests too deeply to draw"
    : "the page failed to draw it; its source is shown as written";
}

/**
 * A prose block that could not be drawn: the reason, then its source as
 * written (scrollable; nothing of it interpreted).
 *
 * @param props `text` (the Markdown), `line` (its first document line), `why`.
 * @returns The block.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { h } from "preact";
 * import { ProseFailed } from "./prose.tsx";
 * const html = renderToString(h(ProseFailed, { text: "<b>*x*</b>", line: 4, why: "it nests" }));
 * if (!html.includes("&lt;b>*x*&lt;/b>") || !html.includes("line 4")) throw new Error(html);
 * ```
 */
export function ProseFailed(props: { text: string; line: number; why: string }): ComponentChild {
  const last = props.line + props.text.replace(/\r?\n$/, "").split("\n").length - 1;
  const where = last > props.line ? `lines ${props.line}–${last}` : `line ${props.line}`;
  return h("div", { class: "pl-prose pl-prose-failed", "data-line": props.line }, [
    h("p", { class: "pl-error" }, [
      h("span", { "aria-hidden": "true" }, "✕ "),
      h("span", { class: "pl-prose-why" }, `This prose could not be drawn: ${props.why}`),
      " ",
      h("span", { class: "pl-where" }, `(${where})`),
    ]),
    h("pre", { class: "pl-prose-source", "aria-label": `Source of ${where}` }, props.text),
  ]);
}

function ProseBody(props: { text: string; line: number; refs: RefRenderer }): ComponentChild {
  const root: Frame = { tag: "div", attrs: {}, children: [] };
  try {
    build(parseProse(props.text), props.line, props.refs, root);
  } catch (e) {
    return h(ProseFailed, { text: props.text, line: props.line, why: proseFailure(e) });
  }
  return h("div", { class: "pl-prose" }, root.children);
}

type ProseProps = { text: string; line: number; refs: RefRenderer };

/**
 * Catches what a prose block throws while the page draws it (an inline
 * value's view, the browser's own stack), so that one block fails alone;
 * a new text is tried again.
 */
class ProseBoundary extends Component<ProseProps, { failed: string | null; why: string }> {
  override state = { failed: null as string | null, why: "" };
  override componentDidCatch(e: unknown): void {
    this.setState({ failed: this.props.text, why: proseFailure(e) });
  }
  override render(): ComponentChild {
    const p = this.props;
    if (this.state.failed === p.text) {
      return h(ProseFailed, { text: p.text, line: p.line, why: this.state.why });
    }
    return h(ProseBody, p);
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
export function Prose(props: ProseProps): ComponentChild {
  return h(ProseBoundary, props);
}
