import { lazy, Suspense, useState, type ComponentType } from 'react';
import { Header } from './Header';
import { NoticeBar } from './NoticeBar';
import { UpdateNotice } from './UpdateNotice';
import { PilotPanel } from './PilotPanel';
import { PlanForm } from './PlanForm';
import { SimulationPanel } from './SimulationPanel';
import { VerdictPanel } from './VerdictPanel';
import { ChartsPanel, ComparisonTable, MethodsPanel, RemediesPanel, VariantsPanel } from './resultPanels';
import { ExplorerSection } from './ExplorerSection';

// The exports panel is built separately and loaded on demand (it brings the PDF code).
const exportModules = import.meta.glob<{ ExportPanel: ComponentType }>('./ExportPanel.tsx');
const exportLoader = exportModules['./ExportPanel.tsx'];
const ExportPanel = exportLoader ? lazy(() => exportLoader().then((m) => ({ default: m.ExportPanel }))) : null;

/** The one-page planner: plan on the left, results on the right. */
export function App() {
  const [exportsOpen, setExportsOpen] = useState(false);
  return (
    <div className="app">
      <a className="skip-link" href="#results">
        Skip to the results
      </a>
      <Header exportsOpen={exportsOpen} onToggleExports={() => setExportsOpen((o) => !o)} exportsAvailable={ExportPanel !== null} />
      <UpdateNotice />
      <NoticeBar />
      {ExportPanel && exportsOpen && (
        <section id="exports-panel" className="exports" aria-label="Exports">
          <Suspense fallback={<p>Loading the exports…</p>}>
            <ExportPanel />
          </Suspense>
        </section>
      )}
      <PilotPanel />
      <main className="layout">
        <div className="form-column">
          <PlanForm />
        </div>
        <div className="results-column" id="results" tabIndex={-1}>
          <VerdictPanel />
          <SimulationPanel />
          <ComparisonTable />
          <ChartsPanel />
          <RemediesPanel />
          <ExplorerSection />
          <MethodsPanel />
          <VariantsPanel />
        </div>
      </main>
      <footer className="app-footer">
        <p>
          Meanward runs entirely in your browser: plans, results and autosaves stay on this computer. Examples and the demo are invented
          scenarios. A planning aid under stated assumptions, not a substitute for a statistician or an ethics board.
        </p>
      </footer>
    </div>
  );
}
