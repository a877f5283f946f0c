import { describe, expect, it } from 'vitest';
import { formatByteSize, tooLargeMessage } from './byte-size';

describe('formatByteSize', () => {
  it.each([
    [0, '0 bytes'],
    [1, '1 byte'],
    [1023, '1023 bytes'],
    [1024, '1 KB'],
    [1536, '1.5 KB'],
    [2 * 1024 * 1024, '2 MB'],
    [8 * 1024 ** 3, '8 GB'],
    [Math.round(2.25 * 1024 ** 3), '2.3 GB'],
    [3 * 1024 ** 4, '3 TB'],
  ])('%d → %s', (bytes, text) => {
    expect(formatByteSize(bytes)).toBe(text);
  });

  it('says the limit in the 413 message', () => {
    expect(tooLargeMessage(8 * 1024 ** 3)).toBe('The file is larger than the limit of 8 GB');
  });
});
