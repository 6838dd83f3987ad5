import { describe, expect, it } from 'vitest';
import { findKnee } from '../../src/design/knee.js';

describe('findKnee (maximum distance to the chord; Satopaa et al. 2011, from memory)', () => {
  it('finds the bend of a falling curve that flattens', () => {
    // y = 1/x on x = 1..10: scaled, the farthest point below the chord is x = 3
    // (recomputed by hand: scaled distance chord - y at x = 2, 3, 4 is 0.444, 0.519, 0.500)
    const points = Array.from({ length: 10 }, (_, i) => ({ x: i + 1, y: 1 / (i + 1) }));
    const knee = findKnee(points);
    expect(knee?.x).toBe(3);
    expect(knee?.bend).toBeCloseTo(0.5185, 4); // 0.7778 - 0.2593, to 4 decimals
  });

  it('finds where a rising risk starts to climb', () => {
    // flat at 0.01 until x = 5, then linear climb: the knee is the last flat point
    const points = [1, 2, 3, 4, 5, 6, 7, 8].map((x) => ({
      x,
      y: x <= 5 ? 0.01 : 0.01 + (x - 5) * 0.1,
    }));
    expect(findKnee(points)?.x).toBe(5);
  });

  it('reports no knee on a straight line, on a concave curve, or on noise-sized change', () => {
    const line = [0, 1, 2, 3, 4].map((x) => ({ x, y: 1 - 0.1 * x }));
    expect(findKnee(line)).toBeUndefined();
    // concave decline (slow then steep): above the chord, not a point of diminishing returns
    const concave = [0, 1, 2, 3, 4].map((x) => ({ x, y: 1 - x * x * 0.05 }));
    expect(findKnee(concave)).toBeUndefined();
    const points = Array.from({ length: 6 }, (_, i) => ({ x: i, y: 0.02 / (i + 1) }));
    expect(findKnee(points, { minChange: 0.05 })).toBeUndefined();
    expect(findKnee(points.slice(0, 2))).toBeUndefined();
  });

  it('does not depend on the order of the points', () => {
    const points = Array.from({ length: 8 }, (_, i) => ({ x: i + 1, y: 1 / (i + 1) }));
    const shuffled = [
      points[5]!,
      points[0]!,
      points[7]!,
      points[2]!,
      points[1]!,
      points[6]!,
      points[3]!,
      points[4]!,
    ];
    const a = findKnee(points);
    const b = findKnee(shuffled);
    expect(b?.x).toBe(a?.x);
    expect(shuffled[b!.index]?.x).toBe(a?.x);
  });
});
