import { describe, expect, it } from 'vitest';
import { SheetEntity } from './sheet.entity';
import { sheetSnapshot, toSheet } from './sheet.mapper';

const A = '5a0c4c8e-1f7e-4b2a-9d55-0e3f2b1a7c01';
const B = '5a0c4c8e-1f7e-4b2a-9d55-0e3f2b1a7c02';
const C = '5a0c4c8e-1f7e-4b2a-9d55-0e3f2b1a7c03';

const sheet = Object.assign(new SheetEntity(), {
  id: '7e1d2c3b-4a5f-4e6d-8c7b-9a0b1c2d3e01',
  campaignId: '0b8e6c1e-3f0e-4d8e-9a51-2c7d1f2e9a01',
  runId: '1c2d3e4f-5a6b-4c7d-8e9f-0a1b2c3d4e01',
  name: 'Warm-up, every 2 s',
  startTime: 0,
  endTime: 60,
  interval: 2,
  readerId: null,
  checkerId: null,
  pass1FinishedAt: null,
  pass2FinishedAt: null,
  createdAt: new Date('2025-01-02T03:04:05.000Z'),
  updatedAt: new Date('2025-01-03T03:04:05.000Z'),
});

describe('toSheet', () => {
  it('maps every wire field, with the row count, the channels in order and both passes still to do', () => {
    expect(toSheet(sheet, [C, A, B])).toEqual({
      id: sheet.id,
      campaignId: sheet.campaignId,
      runId: sheet.runId,
      name: 'Warm-up, every 2 s',
      startTime: 0,
      endTime: 60,
      interval: 2,
      channelIds: [C, A, B],
      rowCount: 31,
      readerId: null,
      checkerId: null,
      status: 'draft',
      progress: { pass1: { done: 0, total: 93 }, pass2: { done: 0, total: 93 } },
      pass1FinishedAt: null,
      pass2FinishedAt: null,
      lock: null,
      createdAt: '2025-01-02T03:04:05.000Z',
      updatedAt: '2025-01-03T03:04:05.000Z',
    });
  });

  it('is open only once both a reader and a checker are assigned', () => {
    const reader = 'aaaaaaaa-1f7e-4b2a-9d55-0e3f2b1a7c01';
    const checker = 'bbbbbbbb-1f7e-4b2a-9d55-0e3f2b1a7c01';
    expect(toSheet({ ...sheet, readerId: reader }, [A]).status).toBe('draft');
    expect(toSheet({ ...sheet, checkerId: checker }, [A]).status).toBe('draft');
    const open = toSheet({ ...sheet, readerId: reader, checkerId: checker }, [A]);
    expect(open).toMatchObject({ status: 'open', readerId: reader, checkerId: checker });
  });

  it('carries the finish times and the release lock', () => {
    const finished = toSheet({ ...sheet, pass1FinishedAt: new Date('2025-01-04T00:00:00.000Z') }, [A], undefined, {
      releaseId: 'cccccccc-1f7e-4b2a-9d55-0e3f2b1a7c01',
      releaseNumber: 2,
    });
    expect(finished.pass1FinishedAt).toBe('2025-01-04T00:00:00.000Z');
    expect(finished.pass2FinishedAt).toBeNull();
    expect(finished.lock).toEqual({ releaseId: 'cccccccc-1f7e-4b2a-9d55-0e3f2b1a7c01', releaseNumber: 2 });
  });

  it('does not share the caller’s channel list', () => {
    const ids = [A, B];
    const wire = toSheet(sheet, ids);
    ids.push(C);
    expect(wire.channelIds).toEqual([A, B]);
  });
});

describe('sheetSnapshot', () => {
  it('records the plan fields only', () => {
    expect(sheetSnapshot(sheet, [B, A])).toEqual({ name: 'Warm-up, every 2 s', startTime: 0, endTime: 60, interval: 2, channelIds: [B, A] });
  });
});
