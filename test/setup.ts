// Shared Vitest setup. DOM-only shims are applied when a test file opts into
// jsdom (`// @vitest-environment jsdom`); node tests are untouched.
import '@testing-library/jest-dom/vitest';
// Every design's closed forms, registered in the engine registry as everywhere outside the page
// (src/core/engineRegistry.ts); test/core/engineRegistry.test.ts checks what happens without them.
import '../src/core/allEngines';
// The design explorer's actions, which the page loads with the explorer panel (src/state/explorerState.ts).
import '../src/state/explorerSlice';
// The pilot reader's actions, which the page loads with the pilot reader's body (src/state/pilotState.ts).
import '../src/state/pilotSlice';

if (typeof window !== 'undefined' && typeof SVGElement !== 'undefined') {
  // jsdom has no layout: estimate text boxes so svg2pdf can place labels.
  const proto = SVGElement.prototype as unknown as { getBBox?: () => DOMRect };
  if (!proto.getBBox) {
    proto.getBBox = function getBBox(this: SVGElement) {
      const text = this.textContent ?? '';
      const size = Number.parseFloat(this.getAttribute('font-size') ?? '10') || 10;
      return { x: 0, y: -size, width: text.length * size * 0.55, height: size } as DOMRect;
    };
  }
  if (typeof HTMLCanvasElement !== 'undefined') {
    HTMLCanvasElement.prototype.getContext = (() => null) as unknown as HTMLCanvasElement['getContext'];
  }
}
