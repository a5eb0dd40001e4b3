import { deferredPanel } from './deferredPanel';

// The panels below the verdict's first screen: the charts (with d3), the methods text and the
// candidate plans. Each is its own chunk, fetched as the page first renders them.
export const ChartsPanel = deferredPanel(() => import('./ChartsPanel').then((m) => m.ChartsPanel)).Panel;
export const MethodsPanel = deferredPanel(() => import('./MethodsPanel').then((m) => m.MethodsPanel)).Panel;
export const VariantsPanel = deferredPanel(() => import('./VariantsPanel').then((m) => m.VariantsPanel)).Panel;
