// Estimated boxes of an SVG's text labels without a layout engine (jsdom has none): the
// same estimate as test/setup.ts' getBBox shim, characters × font size × 0.55 (0.6 for
// bold), from memory of typical sans-serif advance widths; height 0.8 em above the
// baseline and 0.25 em below it. Handles text-anchor and the one transform the charts
// use on text, translate(x,y) rotate(-90).

/** An estimated text box in the SVG's user units. */
export interface TextBox {
  text: string;
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

function inherited(el: Element, name: string): string | null {
  for (let e: Element | null = el; e; e = e.parentElement) {
    const v = e.getAttribute(name);
    if (v !== null) return v;
  }
  return null;
}

/** Estimated box of every non-empty text element in `svg`. */
export function textBoxes(svg: Element): TextBox[] {
  const boxes: TextBox[] = [];
  for (const t of Array.from(svg.querySelectorAll('text'))) {
    const content = t.textContent ?? '';
    if (content.trim() === '') continue;
    const size = Number.parseFloat(inherited(t, 'font-size') ?? '11');
    const bold = inherited(t, 'font-weight') === 'bold';
    const w = content.length * size * (bold ? 0.6 : 0.55);
    const anchor = inherited(t, 'text-anchor') ?? 'start';
    const x = Number.parseFloat(t.getAttribute('x') ?? '0');
    const y = Number.parseFloat(t.getAttribute('y') ?? '0');
    const lx0 = x - (anchor === 'middle' ? w / 2 : anchor === 'end' ? w : 0);
    const ly0 = y - 0.8 * size;
    const ly1 = y + 0.25 * size;
    const m = /translate\(([-\d.]+),\s*([-\d.]+)\)\s*rotate\(-90\)/.exec(t.getAttribute('transform') ?? '');
    if (m) {
      const tx = Number(m[1]);
      const ty = Number(m[2]);
      // rotate(-90) maps local (u, v) to (v, -u).
      boxes.push({ text: content, x0: tx + ly0, x1: tx + ly1, y0: ty - (lx0 + w), y1: ty - lx0 });
    } else {
      boxes.push({ text: content, x0: lx0, x1: lx0 + w, y0: ly0, y1: ly1 });
    }
  }
  return boxes;
}

/** Labels whose estimated box leaves the SVG's width × height (with `slack` px allowed). */
export function clippedLabels(svg: Element, slack = 1): string[] {
  const width = Number(svg.getAttribute('width'));
  const height = Number(svg.getAttribute('height'));
  return textBoxes(svg)
    .filter((b) => b.x0 < -slack || b.y0 < -slack || b.x1 > width + slack || b.y1 > height + slack)
    .map((b) => `"${b.text}" at x ${b.x0.toFixed(0)}..${b.x1.toFixed(0)}, y ${b.y0.toFixed(0)}..${b.y1.toFixed(0)} in ${width} × ${height}`);
}

/** Pairs of labels whose estimated boxes overlap by more than `tolerance` px in both directions. */
export function overlappingLabels(svg: Element, tolerance = 1): string[] {
  const boxes = textBoxes(svg);
  const out: string[] = [];
  for (let i = 0; i < boxes.length; i++) {
    for (let j = i + 1; j < boxes.length; j++) {
      const a = boxes[i]!;
      const b = boxes[j]!;
      const ox = Math.min(a.x1, b.x1) - Math.max(a.x0, b.x0);
      const oy = Math.min(a.y1, b.y1) - Math.max(a.y0, b.y0);
      if (ox > tolerance && oy > tolerance) out.push(`"${a.text}" overlaps "${b.text}" (${ox.toFixed(0)} × ${oy.toFixed(0)} px)`);
    }
  }
  return out;
}
