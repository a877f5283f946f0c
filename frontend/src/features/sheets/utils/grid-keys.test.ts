import { describe, expect, it } from 'vitest';
import { PAGE_ROWS, gridMove } from './grid-keys';

describe('gridMove', () => {
  it('moves by a cell, a page, or to the ends', () => {
    expect(gridMove('ArrowDown', false, 4, 2, 100, 6)).toEqual({ pos: 5, col: 2 });
    expect(gridMove('ArrowLeft', false, 4, 2, 100, 6)).toEqual({ pos: 4, col: 1 });
    expect(gridMove('PageDown', false, 4, 2, 100, 6)).toEqual({ pos: 4 + PAGE_ROWS, col: 2 });
    expect(gridMove('End', false, 4, 2, 100, 6)).toEqual({ pos: 4, col: 5 });
    expect(gridMove('End', true, 4, 2, 100, 6)).toEqual({ pos: 99, col: 5 });
    expect(gridMove('ArrowUp', true, 40, 3, 100, 6)).toEqual({ pos: 0, col: 3 });
  });

  it('opens the cell on Enter or F2 and leaves other keys alone', () => {
    expect(gridMove('Enter', false, 0, 0, 10, 6)).toBe('edit');
    expect(gridMove('F2', false, 0, 0, 10, 6)).toBe('edit');
    expect(gridMove('a', false, 0, 0, 10, 6)).toBeNull();
  });
});
