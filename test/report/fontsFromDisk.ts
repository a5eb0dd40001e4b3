// The PDF fonts read straight from src/report/fonts. Under Vitest, Vite rewrites
// `new URL(..., import.meta.url)` to a dev-server address, so tests pass the
// fonts explicitly instead of letting the builder fetch them.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { ReportFonts } from '../../src/report/reportFonts';

const dir = path.resolve(__dirname, '../../src/report/fonts');
const b64 = (f: string) => readFileSync(path.join(dir, f)).toString('base64');

export const TEST_FONTS: ReportFonts = {
  regular: b64('DejaVuSans.ttf'),
  bold: b64('DejaVuSans-Bold.ttf'),
  mono: b64('DejaVuSansMono.ttf'),
};
