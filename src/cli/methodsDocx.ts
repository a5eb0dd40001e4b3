import { Document, HeadingLevel, Packer, Paragraph, TextRun } from 'docx';
import type { MethodsText } from '../core/methodsText';
import { methodsParagraphText } from '../report/methodsTextRender';

/**
 * The methods text (src/core/methodsText.ts) as a Word document, built with
 * the `docx` library (never a hand-written zip): a title, one paragraph per
 * part with its heading in bold, the planning caution in italics, and the
 * references. The text is the same as the Markdown's (methodsParagraphText).
 * @returns the .docx file's bytes.
 */
export async function methodsDocx(m: MethodsText): Promise<Uint8Array> {
  const body: Paragraph[] = [new Paragraph({ heading: HeadingLevel.HEADING_1, children: [new TextRun(`Methods: ${m.title}`)] })];
  for (const p of m.paragraphs) {
    body.push(new Paragraph({ spacing: { after: 160 }, children: [new TextRun({ text: `${p.heading}. `, bold: true }), new TextRun(methodsParagraphText(p))] }));
  }
  body.push(new Paragraph({ spacing: { after: 160 }, children: [new TextRun({ text: m.caution, italics: true })] }));
  body.push(new Paragraph({ heading: HeadingLevel.HEADING_2, children: [new TextRun('References')] }));
  for (const r of m.references) body.push(new Paragraph({ indent: { left: 360, hanging: 360 }, children: [new TextRun(r.entry)] }));
  const doc = new Document({ creator: 'Meanward', title: `Methods: ${m.title}`, sections: [{ children: body }] });
  return new Uint8Array(await Packer.toBuffer(doc));
}
