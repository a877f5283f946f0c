import { afterEach, describe, expect, it, vi } from 'vitest';
import { QueryClient, QueryObserver } from '@tanstack/react-query';
import { stubFetch } from '@/testing/fetch-stub';
import { makeReading, makeRows, makeSheetGrid, makeSheetGridWire } from '@/testing/sheet-fixtures';
import { getSheetGridQueryOptions, prefetchSheetGrid } from './get-sheet-grid';

// The route loader starts the grid request before the page knows what the viewer may see; the
// table's query then takes that request over (still in flight) or its answer (already in).

const rows = makeRows(2);
const plan = { rows, channelIds: ['t1'], pass1: [makeReading({ pass: 1, rowIndex: 1, channelId: 't1', rawText: '21.5' })], pass2: null };
const view = { see1: true, see2: false, withResolutions: false };

function setUp(sheetId: string) {
  const network = stubFetch({ 'GET /api/sheets/:sheetId/grid': { body: makeSheetGridWire(plan) } });
  const client = new QueryClient({ defaultOptions: { queries: { staleTime: 30_000, retry: false } } });
  const observe = () => new QueryObserver(client, getSheetGridQueryOptions(sheetId, view));
  const calls = () => network.callsTo('GET /api/sheets/:sheetId/grid').length;
  /** Starts the early request and waits until its answer is read and laid out. */
  const prefetchAndSettle = async () => {
    prefetchSheetGrid(sheetId);
    await vi.waitFor(() => expect(calls()).toBe(1));
    await new Promise((resolve) => setTimeout(resolve, 0));
  };
  return { client, observe, calls, prefetchAndSettle };
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('the early grid request', () => {
  it('fills the table’s query at once when its answer is already in, laid out, without asking again', async () => {
    const { client, observe, calls, prefetchAndSettle } = setUp('sheet-settled');
    await prefetchAndSettle();

    const first = observe().getCurrentResult();
    expect(first.status).toBe('success');
    expect(first.data?.pass1?.rawText).toEqual(makeSheetGrid(plan).pass1?.rawText);
    expect(first.data?.pass1?.rawText).toEqual([null, '21.5']);
    // Fresh as when it arrived: mounting does not fetch again.
    const unsubscribe = observe().subscribe(() => undefined);
    await new Promise((resolve) => setTimeout(resolve, 10));
    unsubscribe();
    expect(calls()).toBe(1);
    client.clear();
  });

  it('is handed over once: a later query of the same sheet asks the server again', async () => {
    const { client, observe, calls, prefetchAndSettle } = setUp('sheet-once');
    await prefetchAndSettle();
    expect(observe().getCurrentResult().status).toBe('success');

    client.clear();
    const again = observe();
    expect(again.getCurrentResult().status).toBe('pending');
    const unsubscribe = again.subscribe(() => undefined);
    await vi.waitFor(() => expect(again.getCurrentResult().status).toBe('success'));
    unsubscribe();
    expect(calls()).toBe(2);
  });

  it('hands a request still in flight to the table’s query rather than making a second one', async () => {
    const sheetId = 'sheet-in-flight';
    const { observe, calls } = setUp(sheetId);
    prefetchSheetGrid(sheetId);
    const observer = observe();
    expect(observer.getCurrentResult().status).toBe('pending');
    const unsubscribe = observer.subscribe(() => undefined);
    await vi.waitFor(() => expect(observer.getCurrentResult().status).toBe('success'));
    unsubscribe();
    expect(observer.getCurrentResult().data?.pass1?.rawText).toEqual([null, '21.5']);
    expect(calls()).toBe(1);
  });
});
