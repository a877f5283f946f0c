import { describe, expect, it } from 'vitest';
import { TransferRate, secondsLeft } from './transfer-rate';

describe('TransferRate', () => {
  it('says nothing until it has seen enough time', () => {
    const rate = new TransferRate(3000, 400);
    expect(rate.bytesPerSecond()).toBeNull();
    rate.add(0, 0);
    rate.add(200, 1_000_000);
    expect(rate.bytesPerSecond()).toBeNull();
    rate.add(500, 2_500_000);
    expect(rate.bytesPerSecond()).toBeCloseTo(5_000_000, 6);
  });

  it('averages over the window, so bursty progress events give a steady figure', () => {
    const rate = new TransferRate(3000, 400);
    rate.add(0, 0);
    // 10 MB/s delivered in uneven bursts every 100–400 ms.
    const steps = [100, 400, 150, 350, 100, 400, 200, 300, 500, 500];
    let t = 0;
    for (const dt of steps) {
      t += dt;
      rate.add(t, t * 10_000);
    }
    expect(rate.bytesPerSecond()).toBeCloseTo(10_000_000, 6);
  });

  it('forgets samples older than the window, following a change of speed', () => {
    const rate = new TransferRate(3000, 400);
    for (let t = 0; t <= 10_000; t += 500) rate.add(t, t * 10_000);
    // Then the link drops to 2 MB/s for 4 s.
    const base = 10_000 * 10_000;
    for (let t = 10_500; t <= 14_000; t += 500) rate.add(t, base + (t - 10_000) * 2_000);
    expect(rate.bytesPerSecond()).toBeCloseTo(2_000_000, 6);
  });

  it('ignores a sample that goes back in time', () => {
    const rate = new TransferRate(3000, 400);
    rate.add(1000, 0);
    rate.add(2000, 1_000_000);
    rate.add(1500, 9_000_000);
    expect(rate.bytesPerSecond()).toBeCloseTo(1_000_000, 6);
  });
});

describe('secondsLeft', () => {
  it('divides what is left by the speed and is unknown without a speed', () => {
    expect(secondsLeft(20e6, 40e6, 10e6)).toBe(2);
    expect(secondsLeft(40e6, 40e6, 10e6)).toBe(0);
    expect(secondsLeft(10, 40, null)).toBeNull();
    expect(secondsLeft(10, 40, 0)).toBeNull();
  });
});
