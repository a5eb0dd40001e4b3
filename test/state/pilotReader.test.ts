// The pilot reader the store uses: the worker protocol's request handler, the
// main-thread client over a stand-in worker (Node has no Worker; the real one
// runs in the browser suite, test/e2e/pilot.spec.ts), and the in-page reader.
// The estimates themselves are src/pilot's (tested there); here the check is
// that they cross the message boundary unchanged, that bad files come back as
// PilotDataErrors with their column and row, and that a newer file wins.
import { describe, expect, it } from 'vitest';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { createInPagePilotReader, loadPilotFunctions, PilotClient, type PilotWorkerFactory } from '../../src/pilot/pilotClient';
import {
  createPilotRequestHandler,
  DISTINCT_LIMIT,
  summariseTableForMapping,
  type FromPilotWorker,
  type ToPilotWorker,
} from '../../src/pilot/pilotWorkerProtocol';
import { PilotDataError, type PilotMapping } from '../../src/pilot/types';
import { inventedPilot } from './pilotTestData';

const FNS = { parseDelimitedText, estimatePilot };
const MAPPING: PilotMapping = {
  group: 'group',
  programmeValue: 'programme',
  pretest: { kind: 'items', columns: ['item1', 'item2', 'item3', 'item4'], combine: 'sum' },
  posttest: 'posttest',
};

/** A stand-in worker: the real request handler, answering asynchronously like postMessage does. */
function fakeWorker() {
  const sent: ToPilotWorker[] = [];
  let created = 0;
  const factory: PilotWorkerFactory = () => {
    created++;
    const handle = createPilotRequestHandler(FNS);
    const w: ReturnType<PilotWorkerFactory> = {
      onmessage: null,
      onerror: null,
      terminate: () => undefined,
      postMessage: (msg: ToPilotWorker) => {
        sent.push(msg);
        void handle(msg).then((reply) => {
          // Structured clone, as postMessage does: errors would lose their class here.
          if (reply) w.onmessage?.({ data: structuredClone(reply) } as MessageEvent<FromPilotWorker>);
        });
      },
    };
    return w;
  };
  return { factory, sent, created: () => created };
}

describe('summariseTableForMapping (what the main thread sees of a file)', () => {
  it('lists columns, caps distinct values, previews 5 rows and never ships the rest', () => {
    const rows = Array.from({ length: 40 }, (_, i) => [i % 2 ? 'A' : 'B', String(i), i === 3 ? 'NA' : String(i / 2), `t${i}`]);
    const s = summariseTableForMapping({ columns: ['g', 'id', 'score', 'note'], rows, delimiter: ',', hasHeader: true }, 'x.csv');
    expect(s.rowCount).toBe(40);
    expect(s.preview).toHaveLength(5);
    expect(s.columns.map((c) => c.name)).toEqual(['g', 'id', 'score', 'note']);
    expect(s.columns[0]).toMatchObject({ distinct: ['B', 'A'], moreDistinct: false, looksNumeric: false });
    expect(s.columns[1]!.distinct).toHaveLength(DISTINCT_LIMIT);
    expect(s.columns[1]!.moreDistinct).toBe(true);
    // A missing-value code ("NA", common practice) does not make a score column text.
    expect(s.columns[2]!.looksNumeric).toBe(true);
    expect(s.columns[3]!.looksNumeric).toBe(false);
    expect(JSON.stringify(s)).not.toContain('t39');
  });
});

describe('PilotClient over a stand-in worker', () => {
  const data = inventedPilot({ seed: 11, programme: 40, comparison: 50, items: 4, posttest: true });

  it('creates the worker on first use, reads, and returns exactly what estimatePilot returns', async () => {
    const w = fakeWorker();
    const client = new PilotClient(w.factory);
    expect(w.created()).toBe(0);
    const summary = await client.read(new Blob([data.text]), 'invented.csv', { delimiter: 'auto', header: 'auto' });
    expect(w.created()).toBe(1);
    // 90 invented people; the '#' label line is skipped.
    expect(summary).toMatchObject({ fileName: 'invented.csv', rowCount: 90, delimiter: ',', hasHeader: true, commentLines: 1 });
    expect(summary.columns.map((c) => c.name)).toEqual(data.columns);
    const viaWorker = await client.estimate(MAPPING);
    const direct = estimatePilot(parseDelimitedText(data.text), MAPPING, 'invented.csv');
    expect(viaWorker).toEqual(direct);
    expect(viaWorker.groups.programme.n).toBe(40);
    expect(viaWorker.groups.comparison.n).toBe(50);
    expect(w.sent.map((m) => m.type)).toEqual(['read', 'estimate']);
  });

  it('turns a bad cell into a PilotDataError naming the column and the spreadsheet row', async () => {
    // Data row 7 is spreadsheet line 9 (comment line 1, header line 2).
    const bad = inventedPilot({ seed: 11, programme: 10, comparison: 10, items: 4, posttest: true, badCell: { row: 7, column: 'item2', text: 'twelve' } });
    const client = new PilotClient(fakeWorker().factory);
    await client.read(bad.text, 'bad.csv', {});
    const err = await client.estimate(MAPPING).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(PilotDataError);
    expect(err).toMatchObject({ code: 'non-numeric', column: 'item2', row: 9 });
    expect((err as Error).message).toContain('twelve');
  });

  it('an empty file is rejected when read, with its code', async () => {
    const client = new PilotClient(fakeWorker().factory);
    const err = await client.read('', 'empty.csv', {}).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(PilotDataError);
    expect(err).toMatchObject({ code: 'empty-file' });
  });

  it('a crashed worker rejects what is waiting and is replaced on the next request', async () => {
    let created = 0;
    let current: ReturnType<PilotWorkerFactory> | null = null;
    const factory: PilotWorkerFactory = () => {
      created++;
      current = { onmessage: null, onerror: null, terminate: () => undefined, postMessage: () => undefined };
      return current;
    };
    const client = new PilotClient(factory);
    const pending = client.read('a,b\n1,2\n', 'x.csv', {});
    current!.onerror?.({ message: 'out of memory' } as ErrorEvent);
    await expect(pending).rejects.toThrow(/stopped unexpectedly: out of memory\. Please choose the file again\./);
    void client.read('a,b\n1,2\n', 'x.csv', {}).catch(() => undefined);
    expect(created).toBe(2);
  });
});

describe('the request handler (the worker’s whole job)', () => {
  it('keeps only the newer file when a slower read is overtaken', async () => {
    const handle = createPilotRequestHandler(FNS);
    const older = handle({ type: 'read', requestId: 1, file: new Blob(['g,x\nA,1\nB,2\nA,3\n']), fileName: 'older.csv', options: {} });
    const newer = handle({ type: 'read', requestId: 2, file: 'h,y\nA,1\nB,2\n', fileName: 'newer.csv', options: {} });
    expect(await older).toBeNull();
    const reply = await newer;
    expect(reply?.type === 'read' && reply.summary.fileName).toBe('newer.csv');
  });

  it('says a file must be chosen before estimating, and forgets the table when told', async () => {
    const handle = createPilotRequestHandler(FNS);
    const before = await handle({ type: 'estimate', requestId: 1, mapping: MAPPING });
    expect(before).toMatchObject({ type: 'error', error: { message: 'No pilot file is open: choose a file first.' } });
    const data = inventedPilot({ seed: 3, programme: 12, comparison: 12, items: 4, posttest: true });
    await handle({ type: 'read', requestId: 2, file: data.text, fileName: 'a.csv', options: {} });
    expect((await handle({ type: 'estimate', requestId: 3, mapping: MAPPING }))?.type).toBe('estimates');
    expect(await handle({ type: 'forget' })).toBeNull();
    expect((await handle({ type: 'estimate', requestId: 4, mapping: MAPPING }))?.type).toBe('error');
  });
});

describe('the in-page reader (no Worker)', () => {
  it('gives the same summary and estimates as the worker path', async () => {
    const data = inventedPilot({ seed: 5, programme: 30, comparison: 30, items: 4, posttest: true });
    const reader = createInPagePilotReader(loadPilotFunctions);
    const summary = await reader.read(data.text, 'inpage.csv', {});
    expect(summary.rowCount).toBe(60);
    expect(await reader.estimate(MAPPING)).toEqual(estimatePilot(parseDelimitedText(data.text), MAPPING, 'inpage.csv'));
    const bad = await reader.read('\u0000\u0001\u0002binary', 'x.xlsx', {}).catch((e: unknown) => e);
    expect(bad).toMatchObject({ code: 'binary-file' });
  });
});
