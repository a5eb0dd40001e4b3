import type { jsPDF } from 'jspdf';
import { svg2pdf } from 'svg2pdf.js';

/**
 * Parse an SVG string into an element svg2pdf can draw. Scripts, event
 * handlers and foreign objects are removed (the PDF never runs them anyway);
 * text is set in the embedded font so Greek letters survive.
 * @throws Error when the text is not well-formed SVG, or no DOMParser exists
 *   (in Node, run under jsdom).
 */
export function parseChartSvg(svgText: string, fontFamily: string): SVGSVGElement {
  if (typeof DOMParser === 'undefined') {
    throw new Error('Drawing charts into the PDF needs a DOM (a browser, or jsdom in Node).');
  }
  const xml = new DOMParser().parseFromString(svgText, 'image/svg+xml');
  const root = xml.documentElement;
  if (!root || root.nodeName.toLowerCase() !== 'svg' || xml.getElementsByTagName('parsererror').length > 0) {
    throw new Error('The chart is not well-formed SVG.');
  }
  for (const bad of Array.from(root.querySelectorAll('script, foreignObject, foreignobject'))) bad.remove();
  for (const el of [root, ...Array.from(root.querySelectorAll('*'))]) {
    for (const attr of Array.from(el.attributes)) {
      if (/^on/i.test(attr.name)) el.removeAttribute(attr.name);
    }
    if (el.hasAttribute('font-family')) el.setAttribute('font-family', fontFamily);
    const style = el.getAttribute('style');
    if (style && /font-family/i.test(style)) {
      el.setAttribute('style', style.replace(/font-family\s*:[^;]*/gi, `font-family: ${fontFamily}`));
    }
  }
  root.setAttribute('font-family', fontFamily);
  return root as unknown as SVGSVGElement;
}

/** The SVG's intrinsic size: width/height attributes, else the viewBox, else 600 × 360. */
export function svgSize(svg: Element): { width: number; height: number } {
  const vb = (svg.getAttribute('viewBox') ?? '').split(/[\s,]+/).map(Number);
  const w = Number.parseFloat(svg.getAttribute('width') ?? '');
  const h = Number.parseFloat(svg.getAttribute('height') ?? '');
  if (Number.isFinite(w) && Number.isFinite(h) && w > 0 && h > 0) return { width: w, height: h };
  if (vb.length === 4 && (vb[2] ?? 0) > 0 && (vb[3] ?? 0) > 0) return { width: vb[2] ?? 600, height: vb[3] ?? 360 };
  return { width: 600, height: 360 };
}

/** Draw a chart SVG as vector graphics at (x, y) scaled to `width` pt, keeping its aspect ratio. */
export async function drawSvgChart(
  doc: jsPDF,
  svg: SVGSVGElement,
  box: { x: number; y: number; width: number; height: number },
): Promise<void> {
  // svg2pdf only changes the font style where an element's weight differs from its
  // parent's, so it inherits whatever style the page text last used: start from the
  // chart's own family in its normal weight, or every label after a bold heading comes out bold.
  const family = svg.getAttribute('font-family');
  if (family && doc.getFontList()[family]?.includes('normal')) doc.setFont(family, 'normal');
  else doc.setFont(doc.getFont().fontName, 'normal');
  await svg2pdf(svg, doc, box);
}

/**
 * The size a chart is drawn at on a PDF page: the full text width, scaled down (keeping its
 * proportions) when it would be taller than 62% of the page's text height.
 * @param page the writer's text width and top/bottom margins (points). @param svg the parsed chart.
 * @returns width and height in points. @throws never.
 * @example chartBoxOnPage({ width: 480, top: 50, bottom: 790 }, svg) // { width: 480, height: 480 · h / w } for a wide chart
 */
export function chartBoxOnPage(page: { width: number; top: number; bottom: number }, svg: Element): { width: number; height: number } {
  const size = svgSize(svg);
  let width = page.width;
  let height = (size.height / size.width) * width;
  const maxHeight = (page.bottom - page.top) * 0.62;
  if (height > maxHeight) {
    width *= maxHeight / height;
    height = maxHeight;
  }
  return { width, height };
}
