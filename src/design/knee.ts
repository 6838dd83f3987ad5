/**
 * The knee of a risk-against-design curve: the value past which a bigger design parameter buys
 * little more (the point of diminishing returns), found by the maximum distance to the chord.
 *
 * Rule (after Satopää, Albrecht, Irwin & Raghavan, "Finding a 'Kneedle' in a haystack:
 * detecting knee points in system behavior", ICDCS Workshops 2011, the normalised-difference
 * idea; citation from memory):
 *   1. sort the points by x and scale both axes to [0, 1] (x by its range, y by its range);
 *   2. draw the chord from the first to the last point;
 *   3. the knee is the interior point farthest below the chord (where the curve is convex):
 *      for a risk that falls with x it is where the steep decline turns flat (more of the
 *      parameter buys little), for a risk that rises with x it is the last value before the
 *      risk climbs steeply. Risk metrics are lower-is-better, so a point above the chord
 *      (a concave stretch) is never a knee;
 *   4. it is reported only when that distance, measured vertically in scaled units, is at least
 *      `minBend` (default 0.1: the curve bends by a tenth of its range), and the risk changes
 *      end to end by more than the statistical noise (`minChange`, the caller passes the
 *      largest CI half-width, so a flat curve made of noise has no knee).
 * With fewer than 3 points there is no knee.
 */

export interface KneePoint {
  x: number;
  y: number;
}

export interface KneeResult {
  /** Index into the input array (not the sorted order). */
  index: number;
  x: number;
  y: number;
  /** Vertical distance to the chord in scaled units (0-1). */
  bend: number;
}

export interface KneeOptions {
  /** Smallest scaled bend reported as a knee (default 0.1). */
  minBend?: number;
  /** Smallest end-to-end change of y (in y's own unit) that counts as a trend (default 0). */
  minChange?: number;
}

/** The knee by the maximum-distance-to-chord rule above, or undefined when there is none. */
export function findKnee(
  points: readonly KneePoint[],
  opts: KneeOptions = {},
): KneeResult | undefined {
  const minBend = opts.minBend ?? 0.1;
  const minChange = opts.minChange ?? 0;
  if (points.length < 3) return undefined;
  if (points.some((p) => !Number.isFinite(p.x) || !Number.isFinite(p.y))) return undefined;
  const order = points.map((_, i) => i).sort((a, b) => points[a]!.x - points[b]!.x);
  const first = points[order[0]!]!;
  const last = points[order[order.length - 1]!]!;
  const xRange = last.x - first.x;
  let yMin = Number.POSITIVE_INFINITY;
  let yMax = Number.NEGATIVE_INFINITY;
  for (const p of points) {
    if (p.y < yMin) yMin = p.y;
    if (p.y > yMax) yMax = p.y;
  }
  const yRange = yMax - yMin;
  const change = last.y - first.y;
  if (!(xRange > 0) || !(yRange > 0) || Math.abs(change) <= minChange || change === 0)
    return undefined;
  let best: KneeResult | undefined;
  for (let k = 1; k < order.length - 1; k++) {
    const i = order[k]!;
    const p = points[i]!;
    const u = (p.x - first.x) / xRange;
    const chordY = (first.y - yMin) / yRange + u * (change / yRange);
    const bend = chordY - (p.y - yMin) / yRange;
    if (bend > 0 && (!best || bend > best.bend)) best = { index: i, x: p.x, y: p.y, bend };
  }
  return best && best.bend >= minBend ? best : undefined;
}
