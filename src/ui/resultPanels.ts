import { deferredPanel } from './deferredPanel';

// The panels below the verdict's first screen: the comparison of analyses, the charts (with d3),
// the remedies, the methods text and the candidate plans. Each is its own chunk, fetched as the
// page first renders them.
export const ComparisonTable = deferredPanel(() => import('./ComparisonTable').then((m) => m.ComparisonTable)).Panel;
export const RemediesPanel = deferredPanel(() => import('./RemediesPanel').then((m) => m.RemediesPanel)).Panel;
export const ChartsPanel = deferredPanel(() => import('./ChartsPanel').then((m) => m.ChartsPanel)).Panel;
export const MethodsPanel = deferredPanel(() => import('./MethodsPanel').then((m) => m.MethodsPanel)).Panel;
export const VariantsPanel = deferredPanel(() => import('./VariantsPanel').then((m) => m.VariantsPanel)).Panel;
