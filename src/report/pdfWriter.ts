/**
 * A small flowing-layout writer over jsPDF: headings, wrapped paragraphs,
 * tables with wrapped cells and repeated headers, monospaced blocks, page
 * breaks and "Page n of N" footers. Every string is drawn as text (never
 * interpreted as markup); long text wraps with splitTextToSize so nothing runs
 * off the page.
 */
import type { jsPDF } from 'jspdf';
import { FONT_MONO, FONT_SANS } from './reportFonts';

export interface TableColumn {
  header: string;
  /** Share of the content width (the shares are normalised). */
  width: number;
  align?: 'left' | 'right';
}

export interface TableOptions {
  /** Font size of the body, pt. */
  fontSize?: number;
  /** Rows drawn bold (e.g. a highlighted row), by index. */
  boldRows?: number[];
  /** First column bold. */
  boldFirstColumn?: boolean;
}

const INK = [25, 25, 30] as const;
const MUTED = [85, 85, 95] as const;
const RULE = [180, 180, 190] as const;
const HEAD_FILL = [232, 236, 244] as const;

export class PdfWriter {
  readonly doc: jsPDF;
  readonly left = 54;
  readonly top = 60;
  readonly bottomMargin = 64;
  y: number;

  constructor(doc: jsPDF) {
    this.doc = doc;
    this.y = this.top;
    doc.setFont(FONT_SANS, 'normal');
    doc.setTextColor(...INK);
  }

  get pageWidth(): number {
    return this.doc.internal.pageSize.getWidth();
  }
  get pageHeight(): number {
    return this.doc.internal.pageSize.getHeight();
  }
  get width(): number {
    return this.pageWidth - 2 * this.left;
  }
  get bottom(): number {
    return this.pageHeight - this.bottomMargin;
  }

  newPage(): void {
    this.doc.addPage();
    this.y = this.top;
  }

  /** Start a new page unless `height` pt still fit on this one. */
  ensure(height: number): void {
    if (this.y + height > this.bottom) this.newPage();
  }

  gap(h: number): void {
    this.y += h;
  }

  /**
   * Wrap text to `width` pt: at spaces, and after hyphens inside long words
   * ("Reliability-" / "corrected"); a word with no break point wider than the
   * line is cut by jsPDF's splitTextToSize.
   */
  private lines(text: string, width: number, size: number, font = FONT_SANS, style = 'normal'): string[] {
    this.doc.setFont(font, style);
    this.doc.setFontSize(size);
    const fits = (s: string) => this.doc.getTextWidth(s) <= width;
    const out: string[] = [];
    for (const para of text.split('\n')) {
      let line = '';
      for (const word of para.split(' ')) {
        // Break points inside the word: after a hyphen or dash that is followed by a letter
        // (never inside a negative number such as "-2.50").
        const pieces = word.split(/(?<=[-–—])(?=\p{L})/u);
        pieces.forEach((piece, k) => {
          const joiner = k === 0 && line !== '' ? ' ' : '';
          if (fits(line + joiner + piece)) {
            line += joiner + piece;
            return;
          }
          if (line !== '') out.push(line);
          if (fits(piece)) {
            line = piece;
          } else {
            const cut = this.doc.splitTextToSize(piece, width) as string[];
            out.push(...cut.slice(0, -1));
            line = cut[cut.length - 1] ?? '';
          }
        });
      }
      out.push(line);
    }
    return out;
  }

  heading(text: string, level: 1 | 2 | 3 = 2): void {
    const size = level === 1 ? 18 : level === 2 ? 13.5 : 11;
    const lh = size * 1.25;
    const lines = this.lines(text, this.width, size, FONT_SANS, 'bold');
    // Keep a heading with at least three lines of what follows.
    this.ensure(lines.length * lh + (level === 1 ? 0 : 8) + 40);
    if (level !== 1 && this.y > this.top) this.y += 8;
    this.doc.setTextColor(...INK);
    for (const line of lines) {
      this.doc.text(line, this.left, this.y + size * 0.8);
      this.y += lh;
    }
    this.y += level === 1 ? 4 : 3;
  }

  paragraph(
    text: string,
    opts: { size?: number; bold?: boolean; muted?: boolean; indent?: number; after?: number; color?: readonly [number, number, number] } = {},
  ): void {
    const size = opts.size ?? 10;
    const indent = opts.indent ?? 0;
    const lh = size * 1.35;
    const lines = this.lines(text, this.width - indent, size, FONT_SANS, opts.bold ? 'bold' : 'normal');
    this.doc.setTextColor(...(opts.color ?? (opts.muted ? MUTED : INK)));
    for (const line of lines) {
      this.ensure(lh);
      this.doc.setFont(FONT_SANS, opts.bold ? 'bold' : 'normal');
      this.doc.setFontSize(size);
      this.doc.text(line, this.left + indent, this.y + size * 0.8);
      this.y += lh;
    }
    this.doc.setTextColor(...INK);
    this.y += opts.after ?? 5;
  }

  /** A numbered or bulleted item with a hanging indent. */
  item(marker: string, text: string, size = 10): void {
    const indent = 16;
    const lh = size * 1.35;
    const lines = this.lines(text, this.width - indent, size);
    this.ensure(Math.min(lines.length, 2) * lh);
    this.doc.setFont(FONT_SANS, 'normal');
    this.doc.setFontSize(size);
    this.doc.text(marker, this.left, this.y + size * 0.8);
    lines.forEach((line, i) => {
      if (i > 0) this.ensure(lh);
      this.doc.setFont(FONT_SANS, 'normal');
      this.doc.setFontSize(size);
      this.doc.text(line, this.left + indent, this.y + size * 0.8);
      this.y += lh;
    });
    this.y += 3;
  }

  /** A boxed note (used for the caution line and "no simulation yet"). */
  note(text: string, size = 9.5): void {
    const pad = 6;
    const lh = size * 1.35;
    const lines = this.lines(text, this.width - 2 * pad - 4, size, FONT_SANS, 'bold');
    const h = lines.length * lh + 2 * pad;
    this.ensure(h);
    this.doc.setFillColor(255, 246, 224);
    this.doc.setDrawColor(214, 160, 40);
    this.doc.setLineWidth(0.8);
    this.doc.rect(this.left, this.y, this.width, h, 'FD');
    this.doc.setTextColor(...INK);
    this.doc.setFont(FONT_SANS, 'bold');
    this.doc.setFontSize(size);
    lines.forEach((line, i) => this.doc.text(line, this.left + pad + 2, this.y + pad + i * lh + size * 0.85));
    this.y += h + 8;
  }

  table(columns: TableColumn[], rows: string[][], opts: TableOptions = {}): void {
    const size = opts.fontSize ?? 8.5;
    const lh = size * 1.3;
    const padX = 4;
    const padY = 3.5;
    const total = columns.reduce((s, c) => s + c.width, 0);
    const widths = columns.map((c) => (c.width / total) * this.width);
    const xs = widths.map((_, i) => this.left + widths.slice(0, i).reduce((s, w) => s + w, 0));

    const wrapRow = (cells: string[], bold: (col: number) => boolean) =>
      cells.map((cell, i) => this.lines(cell, (widths[i] ?? 0) - 2 * padX, size, FONT_SANS, bold(i) ? 'bold' : 'normal'));
    const heightOf = (wrapped: string[][]) => Math.max(...wrapped.map((l) => l.length)) * lh + 2 * padY;

    const header = wrapRow(
      columns.map((c) => c.header),
      () => true,
    );
    const drawRow = (wrapped: string[][], isHeader: boolean, bold: (col: number) => boolean) => {
      const h = heightOf(wrapped);
      if (isHeader) {
        this.doc.setFillColor(...HEAD_FILL);
        this.doc.rect(this.left, this.y, this.width, h, 'F');
      }
      wrapped.forEach((lines, i) => {
        const col = columns[i];
        const x0 = xs[i] ?? this.left;
        const w = widths[i] ?? 0;
        this.doc.setFont(FONT_SANS, isHeader || bold(i) ? 'bold' : 'normal');
        this.doc.setFontSize(size);
        this.doc.setTextColor(...INK);
        lines.forEach((line, k) => {
          const ty = this.y + padY + k * lh + size * 0.85;
          if (col?.align === 'right') this.doc.text(line, x0 + w - padX, ty, { align: 'right' });
          else this.doc.text(line, x0 + padX, ty);
        });
      });
      this.y += h;
      this.doc.setDrawColor(...RULE);
      this.doc.setLineWidth(0.5);
      this.doc.line(this.left, this.y, this.left + this.width, this.y);
    };

    this.ensure(heightOf(header) + lh * 2 + 2 * padY);
    drawRow(header, true, () => true);
    rows.forEach((row, r) => {
      const isBold = (c: number) => (opts.boldRows?.includes(r) ?? false) || (c === 0 && (opts.boldFirstColumn ?? false));
      const wrapped = wrapRow(row, isBold);
      const h = heightOf(wrapped);
      if (this.y + h > this.bottom) {
        this.newPage();
        drawRow(header, true, () => true);
      }
      drawRow(wrapped, false, isBold);
    });
    this.y += 8;
  }

  /**
   * Monospaced lines (e.g. the plan JSON). A line wider than the page is cut
   * into pieces; every piece but the last ends with `continuation`, so a
   * reader can rejoin them exactly. Cuts never fall just before a space, so no
   * piece starts with whitespace (which text extraction may drop).
   */
  mono(lines: string[], continuation: string, size = 7.5): void {
    const lh = size * 1.3;
    this.doc.setFont(FONT_MONO, 'normal');
    this.doc.setFontSize(size);
    const charW = this.doc.getTextWidth('M');
    const perLine = Math.max(10, Math.floor(this.width / charW) - 2);
    const pieces: string[] = [];
    for (const line of lines) {
      let rest = line;
      while (rest.length > perLine) {
        let cut = perLine - 1;
        while (cut > 1 && rest[cut] === ' ') cut--;
        pieces.push(rest.slice(0, cut) + continuation);
        rest = rest.slice(cut);
      }
      pieces.push(rest);
    }
    this.doc.setTextColor(...INK);
    for (const piece of pieces) {
      this.ensure(lh);
      this.doc.setFont(FONT_MONO, 'normal');
      this.doc.setFontSize(size);
      this.doc.text(piece, this.left, this.y + size * 0.8);
      this.y += lh;
    }
    this.doc.setFont(FONT_SANS, 'normal');
    this.y += 6;
  }

  /** Footers on every page: a left note and "Page n of N". */
  footers(leftNote: string): void {
    const n = this.doc.getNumberOfPages();
    for (let i = 1; i <= n; i++) {
      this.doc.setPage(i);
      this.doc.setFont(FONT_SANS, 'normal');
      this.doc.setFontSize(8);
      this.doc.setTextColor(...MUTED);
      const fy = this.pageHeight - this.bottomMargin / 2;
      const note = (this.doc.splitTextToSize(leftNote, this.width - 80) as string[])[0] ?? '';
      this.doc.text(note, this.left, fy);
      this.doc.text(`Page ${i} of ${n}`, this.left + this.width, fy, { align: 'right' });
    }
    this.doc.setTextColor(...INK);
  }
}
