// Read a PDF back with pdfjs-dist (an independent PDF reader) for the report
// tests: text per page as lines, with the footer band kept apart so a block
// that continues across pages (the plan file) can be rejoined.
import { createRequire } from 'node:module';
import path from 'node:path';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

const require = createRequire(import.meta.url);
const standardFontDataUrl = `${path.join(path.dirname(require.resolve('pdfjs-dist/package.json')), 'standard_fonts')}/`;

export interface PdfText {
  pages: number;
  /** Body lines of every page, top to bottom, pages in order (footers excluded). */
  body: string[];
  /** Footer lines, one array per page. */
  footers: string[][];
  /** Everything, body and footers, joined with newlines. */
  all: string;
  /** Page sizes in pt. */
  sizes: { width: number; height: number }[];
  /** Every text item with its position, for layout checks (x, y from the bottom-left, width). */
  items: { page: number; str: string; x: number; y: number; width: number }[];
}

/** Footer band: text drawn below this many pt from the bottom is a footer (the writer's bottom margin is 64 pt). */
const FOOTER_BAND = 50;

export async function readPdfText(bytes: Uint8Array): Promise<PdfText> {
  // pdfjs detaches the buffer it is given: pass a copy.
  const pdf = await getDocument({ data: bytes.slice(), standardFontDataUrl, useSystemFonts: false }).promise;
  const body: string[] = [];
  const footers: string[][] = [];
  const sizes: PdfText['sizes'] = [];
  const items: PdfText['items'] = [];
  for (let p = 1; p <= pdf.numPages; p++) {
    const page = await pdf.getPage(p);
    const vp = page.getViewport({ scale: 1 });
    sizes.push({ width: vp.width, height: vp.height });
    const content = await page.getTextContent();
    // Group items into lines by baseline (rounded), top to bottom, left to right.
    const lines = new Map<number, { x: number; end: number; str: string }[]>();
    for (const it of content.items) {
      if (!('str' in it) || it.str === '') continue;
      const x = it.transform[4] as number;
      const y = it.transform[5] as number;
      items.push({ page: p, str: it.str, x, y, width: it.width });
      const key = Math.round(y);
      const line = lines.get(key) ?? [];
      line.push({ x, end: x + it.width, str: it.str });
      lines.set(key, line);
    }
    const ordered = [...lines.entries()].sort((a, b) => b[0] - a[0]);
    const pageFooters: string[] = [];
    for (const [y, parts] of ordered) {
      // Rejoin pieces exactly: a space only where there is a visible gap and no space already
      // (table cells), so text set with spaces (the plan file) comes back character for character.
      parts.sort((a, b) => a.x - b.x);
      let text = '';
      let prevEnd = -Infinity;
      for (const q of parts) {
        const gap = q.x - prevEnd > 1.5 && text !== '' && !/\s$/.test(text) && !/^\s/.test(q.str);
        text += (gap ? ' ' : '') + q.str;
        prevEnd = q.end;
      }
      if (y < FOOTER_BAND) pageFooters.push(text);
      else body.push(text);
    }
    footers.push(pageFooters);
  }
  const all = body.join('\n') + '\n' + footers.map((f) => f.join('\n')).join('\n');
  await pdf.destroy();
  return { pages: pdf.numPages, body, footers, all, sizes, items };
}
