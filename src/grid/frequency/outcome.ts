/**
 * Outcome metrics of one event, gathered on the integrator's dense output segment by segment:
 * nadir and zenith (including an extremum inside a step, located where the dense output's slope
 * vanishes), and the RoCoF measured as a relay does, over a sliding window W:
 *   RoCoF_W(t) = (f(t) - f(t - W)) / W,  sampled every W / 5,
 * whose largest magnitude is `rocofMaxHzPerS`. (Measuring over a window, not the instantaneous
 * derivative, is how RoCoF relays and grid codes define it, e.g. ENTSO-E "RoCoF withstand
 * capability" guidance 2018, 500 ms windows; common practice, no source for the W/5 sampling.)
 */
import type { DormandPrince } from '../../numeric/dormand-prince.js';
import { illinoisRoot, type ScalarFunction } from '../../numeric/root.js';

/** Samples per RoCoF window. */
const SAMPLES_PER_WINDOW = 5;

/** d/dtheta of the frequency component of the dense output (for the interior extremum). */
class FrequencySlope implements ScalarFunction {
  integ: DormandPrince | null = null;
  value(theta: number): number {
    return this.integ!.interpolateComponentSlope(0, theta);
  }
}

export class OutcomeTracker {
  nadirPu = 0;
  nadirTimeS = 0;
  zenithPu = 0;
  zenithTimeS = 0;
  rocofMaxPuPerS = 0;
  /** Latest windowed RoCoF, pu/s, and whether a full window exists yet. */
  rocofNowPuPerS = 0;
  rocofReady = false;
  /** Time of the next RoCoF sample, s. */
  nextSampleS = 0;
  private windowS = 0.1;
  private sampleS = 0.02;
  private readonly ring = new Float64Array(SAMPLES_PER_WINDOW + 1);
  private count = 0;
  private head = 0;
  private readonly slope = new FrequencySlope();
  /** Interior extremum of the last segment: theta (or -1) and value. */
  extremumTheta = -1;
  extremumPu = 0;

  start(windowS: number, dw0Pu: number): void {
    this.windowS = windowS;
    this.sampleS = windowS / SAMPLES_PER_WINDOW;
    this.nadirPu = dw0Pu;
    this.zenithPu = dw0Pu;
    this.nadirTimeS = 0;
    this.zenithTimeS = 0;
    this.rocofMaxPuPerS = 0;
    this.rocofNowPuPerS = 0;
    this.rocofReady = false;
    this.count = 0;
    this.ring.fill(dw0Pu);
    this.ring[0] = dw0Pu;
    this.head = 1;
    this.count = 1;
    this.nextSampleS = this.sampleS;
  }

  /**
   * Finds an extremum of the frequency inside the last accepted step (slopes of opposite sign at
   * its ends); sets extremumTheta (-1 if none).
   */
  findExtremum(integ: DormandPrince): void {
    this.extremumTheta = -1;
    const s0 = integ.k1[0]!;
    const s1 = integ.k7[0]!;
    if (!(s0 * s1 < 0)) return;
    this.slope.integ = integ;
    // Root of the slope to 1e-9 of the step: the value error is second order in it.
    const theta = illinoisRoot(this.slope, 0, 1, s0 * integ.hS, s1 * integ.hS, 1e-9);
    this.extremumTheta = theta;
    this.extremumPu = integ.interpolateComponent(0, theta);
  }

  private extremes(vPu: number, tS: number): void {
    if (vPu < this.nadirPu) {
      this.nadirPu = vPu;
      this.nadirTimeS = tS;
    }
    if (vPu > this.zenithPu) {
      this.zenithPu = vPu;
      this.zenithTimeS = tS;
    }
  }

  /**
   * Records the segment [t0, t0 + thetaEnd h] of the last accepted step. Returns true when a RoCoF
   * sample was taken (the caller then checks the RoCoF monitors against rocofNowPuPerS... at the
   * segment end, an approximation of at most one sample interval).
   */
  segment(integ: DormandPrince, thetaEnd: number): boolean {
    const t0 = integ.t0;
    const h = integ.hS;
    const tEnd = t0 + thetaEnd * h;
    if (this.extremumTheta >= 0 && this.extremumTheta <= thetaEnd)
      this.extremes(this.extremumPu, t0 + this.extremumTheta * h);
    this.extremes(integ.interpolateComponent(0, thetaEnd), tEnd);
    let sampled = false;
    const ring = this.ring;
    const len = ring.length;
    while (this.nextSampleS <= tEnd) {
      const v = integ.interpolateComponent(0, (this.nextSampleS - t0) / h);
      this.extremes(v, this.nextSampleS);
      // Ring of the last SAMPLES_PER_WINDOW + 1 samples; `head` is where the next one goes, and
      // after the write it holds the sample one window old (integer wrap: no modulo in the loop).
      ring[this.head] = v;
      this.head = this.head + 1 === len ? 0 : this.head + 1;
      this.count++;
      if (this.count > SAMPLES_PER_WINDOW) {
        const r = (v - ring[this.head]!) / this.windowS;
        this.rocofNowPuPerS = r;
        this.rocofReady = true;
        const a = r < 0 ? -r : r;
        if (a > this.rocofMaxPuPerS) this.rocofMaxPuPerS = a;
      }
      this.nextSampleS = this.count * this.sampleS;
      sampled = true;
    }
    return sampled;
  }
}
