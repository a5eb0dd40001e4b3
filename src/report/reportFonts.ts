/**
 * Fonts embedded in the PDF summary: DejaVu Sans (regular, bold) and DejaVu
 * Sans Mono, which cover Greek letters and maths symbols that the PDF's
 * standard fonts (Latin-1 only) lack. Licence: Bitstream Vera / public domain
 * (fonts/LICENSE-DejaVu.txt) permits embedding and redistribution.
 */
import type { jsPDF } from 'jspdf';

/** The three font files as base64 strings. */
export interface ReportFonts {
  regular: string;
  bold: string;
  mono: string;
}

/** Font family names registered with jsPDF. */
export const FONT_SANS = 'DejaVuSans';
export const FONT_MONO = 'DejaVuSansMono';

const FILES = {
  regular: new URL('./fonts/DejaVuSans.ttf', import.meta.url),
  bold: new URL('./fonts/DejaVuSans-Bold.ttf', import.meta.url),
  mono: new URL('./fonts/DejaVuSansMono.ttf', import.meta.url),
} as const;

function toBase64(bytes: Uint8Array): string {
  let s = '';
  const chunk = 0x8000;
  for (let i = 0; i < bytes.length; i += chunk) {
    s += String.fromCharCode(...bytes.subarray(i, i + chunk));
  }
  return btoa(s);
}

async function readBytes(url: URL): Promise<Uint8Array> {
  if (url.protocol === 'file:') {
    // Node (tests, scripts): read from disk. The module name is a variable so
    // the browser bundle never tries to include Node's file system.
    const fsName = 'node:fs/promises';
    const fs = (await import(/* @vite-ignore */ fsName)) as { readFile(u: URL): Promise<Uint8Array> };
    return new Uint8Array(await fs.readFile(url));
  }
  const res = await fetch(url);
  if (!res.ok) throw new Error(`Could not load the PDF font ${url.pathname} (HTTP ${res.status}).`);
  return new Uint8Array(await res.arrayBuffer());
}

let cached: Promise<ReportFonts> | null = null;

/**
 * Load the embedded fonts once (browser: fetched from the built assets; Node:
 * read from src/report/fonts).
 * @throws Error when a font file cannot be loaded.
 */
export function loadReportFonts(): Promise<ReportFonts> {
  cached ??= Promise.all([readBytes(FILES.regular), readBytes(FILES.bold), readBytes(FILES.mono)])
    .then(([regular, bold, mono]) => ({ regular: toBase64(regular), bold: toBase64(bold), mono: toBase64(mono) }))
    .catch((e: unknown) => {
      cached = null;
      throw e;
    });
  return cached;
}

/** Register the fonts with a jsPDF document. */
export function registerReportFonts(doc: jsPDF, fonts: ReportFonts): void {
  doc.addFileToVFS('DejaVuSans.ttf', fonts.regular);
  doc.addFont('DejaVuSans.ttf', FONT_SANS, 'normal');
  doc.addFileToVFS('DejaVuSans-Bold.ttf', fonts.bold);
  doc.addFont('DejaVuSans-Bold.ttf', FONT_SANS, 'bold');
  doc.addFileToVFS('DejaVuSansMono.ttf', fonts.mono);
  doc.addFont('DejaVuSansMono.ttf', FONT_MONO, 'normal');
}
