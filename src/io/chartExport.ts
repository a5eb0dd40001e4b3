/**
 * Chart and file downloads: a chart's SVG as a standalone, well-formed SVG
 * file; the same chart as PNG (browser canvas); and a helper that hands any
 * text or bytes to the browser as a download.
 */

const SVG_NS = 'http://www.w3.org/2000/svg';

/**
 * A chart's SVG markup made into a standalone file: XML declaration, the SVG
 * namespace, explicit width/height (from the viewBox when missing), scripts
 * and event handlers removed, and a white background (a rectangle) so it reads in any viewer.
 * @throws Error when the markup is not well-formed SVG, or no DOMParser exists.
 */
export function standaloneSvg(svgText: string): string {
  if (typeof DOMParser === 'undefined' || typeof XMLSerializer === 'undefined') {
    throw new Error('Saving a chart as SVG needs a browser (or jsdom).');
  }
  let text = svgText.trim();
  // Markup taken from an HTML page may lack the namespace; add it before parsing as XML.
  if (/^<svg\b/i.test(text) && !/^<svg\b[^>]*\sxmlns=/i.test(text)) text = text.replace(/^<svg\b/i, `<svg xmlns="${SVG_NS}"`);
  const doc = new DOMParser().parseFromString(text, 'image/svg+xml');
  const root = doc.documentElement;
  if (!root || root.localName !== 'svg' || doc.getElementsByTagName('parsererror').length > 0) {
    throw new Error('The chart could not be saved: its drawing is not well-formed SVG.');
  }
  for (const bad of Array.from(root.querySelectorAll('script, foreignObject'))) bad.remove();
  for (const el of [root, ...Array.from(root.querySelectorAll('*'))]) {
    for (const attr of Array.from(el.attributes)) if (/^on/i.test(attr.name)) el.removeAttribute(attr.name);
  }
  const vb = (root.getAttribute('viewBox') ?? '').split(/[\s,]+/).map(Number);
  if (!root.getAttribute('width') && vb.length === 4 && Number.isFinite(vb[2])) root.setAttribute('width', String(vb[2]));
  if (!root.getAttribute('height') && vb.length === 4 && Number.isFinite(vb[3])) root.setAttribute('height', String(vb[3]));
  // A white background as a drawn rectangle, not a style attribute: the page's Content-Security-Policy
  // (style-src 'self') also covers documents it parses, and a rect reads the same in every viewer.
  if (!root.querySelector(':scope > rect[data-background]')) {
    const bg = doc.createElementNS(SVG_NS, 'rect');
    for (const [k, v] of [['data-background', 'true'], ['x', '0'], ['y', '0'], ['width', '100%'], ['height', '100%'], ['fill', '#ffffff']]) bg.setAttribute(k!, v!);
    const firstDrawn = Array.from(root.children).find((c) => c.localName !== 'title' && c.localName !== 'desc' && c.localName !== 'defs');
    root.insertBefore(bg, firstDrawn ?? null);
  }
  return `<?xml version="1.0" encoding="UTF-8"?>\n${new XMLSerializer().serializeToString(root)}\n`;
}

/**
 * A file name for a download: the plan's title reduced to letters, digits and
 * hyphens (at most 60 characters), then the part name and extension.
 * @example downloadFileName('Falls <pilot> 2026', 'pretest', 'svg') === 'falls-pilot-2026-pretest.svg'
 */
export function downloadFileName(planTitle: string, part: string, ext: string): string {
  const slug = planTitle
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return `${slug || 'meanward-plan'}-${part}.${ext}`;
}

/**
 * Render a chart's SVG to a PNG in the browser (canvas), at `scale` times its
 * size (2 = sharp on high-density screens and in documents).
 * @throws Error when the browser cannot draw the image.
 */
export async function svgToPngBlob(svgText: string, scale = 2): Promise<Blob> {
  const file = standaloneSvg(svgText);
  const root = new DOMParser().parseFromString(file, 'image/svg+xml').documentElement;
  const width = Number.parseFloat(root.getAttribute('width') ?? '') || 800;
  const height = Number.parseFloat(root.getAttribute('height') ?? '') || 480;
  const url = URL.createObjectURL(new Blob([file], { type: 'image/svg+xml' }));
  try {
    const img = new Image();
    img.decoding = 'async';
    await new Promise<void>((resolve, reject) => {
      img.onload = () => resolve();
      img.onerror = () => reject(new Error('The browser could not draw the chart as an image.'));
      img.src = url;
    });
    const canvas = document.createElement('canvas');
    canvas.width = Math.round(width * scale);
    canvas.height = Math.round(height * scale);
    const ctx = canvas.getContext('2d');
    if (!ctx) throw new Error('This browser cannot draw images (no canvas), so the PNG could not be made.');
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, canvas.width, canvas.height);
    ctx.drawImage(img, 0, 0, canvas.width, canvas.height);
    return await new Promise<Blob>((resolve, reject) =>
      canvas.toBlob((b) => (b ? resolve(b) : reject(new Error('The PNG could not be made.'))), 'image/png'),
    );
  } finally {
    URL.revokeObjectURL(url);
  }
}

/** Hand text or bytes to the browser as a file download. */
export function downloadFile(content: Blob | string | Uint8Array, fileName: string, type: string): void {
  const blob =
    content instanceof Blob ? content : new Blob([typeof content === 'string' ? content : new Uint8Array(content)], { type });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Give the browser a moment to start the download before releasing the URL.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
