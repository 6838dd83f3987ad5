/**
 * The casual baseline of the benchmark: the same island model as src/grid/frequency, written the
 * way a first prototype usually is: an object with closures per source, state as plain arrays
 * rebuilt every step, fixed-step RK4 at 5 ms, and thresholds noticed at the end of the step.
 * It exists only to measure how much the engine's design buys (`naive_events_per_s`); it is not
 * used for results. Same equations and sources as the engine's model files.
 */
import type { Case } from '../case/schema.js';
import type { Scenario } from '../sample/scenario.js';

interface NaiveSource {
  kind: string;
  online: boolean;
  formsGrid: boolean;
  kinetic: number;
  state: number[];
  output: (x: number[], dw: number) => number;
  derivative: (x: number[], dw: number, rocof: number, p: number) => number[];
  gfOutput?: (dw: number, rocof: number) => number;
  limits?: () => [number, number];
  trips: { levelPu: number; below: boolean; delayS: number; since: number }[];
}

export interface NaiveOutcome {
  nadirHz: number;
  shedStages: number;
  shutdown: boolean;
}

export function naiveSimulate(c: Case, op: Scenario, horizonS: number): NaiveOutcome {
  const sb = c.system.baseKva;
  const f0 = c.system.frequencyHz;
  const loads = c.loads.map((l, j) => ({
    tier: l.tier,
    p: op.loadKw[j]! / sb,
    d: l.frequencySensitivityPu,
  }));
  const sources: NaiveSource[] = c.sources.map((s, i) => {
    const running = op.available[i] === 1 && op.running[i] === 1 && op.trippedAtSeparation[i] === 0;
    const p0 = running ? op.dispatchKw[i]! / sb : 0;
    const rating = s.ratingKw / sb;
    const trips = (
      s.kind === 'genset' ? [s.trips] : [s.trips ?? c.protection.inverterTrips]
    ).flatMap((t) =>
      t
        ? [
            ...(t.underFrequencyHz
              ? [
                  {
                    levelPu: t.underFrequencyHz / f0 - 1,
                    below: true,
                    delayS: t.underFrequencyDelayS,
                    since: -1,
                  },
                ]
              : []),
            ...(t.overFrequencyHz
              ? [
                  {
                    levelPu: t.overFrequencyHz / f0 - 1,
                    below: false,
                    delayS: t.overFrequencyDelayS,
                    since: -1,
                  },
                ]
              : []),
          ]
        : [
            { levelPu: 56.5 / 60 - 1, below: true, delayS: 0.16, since: -1 },
            { levelPu: 62 / 60 - 1, below: false, delayS: 0.16, since: -1 },
          ],
    );
    const base = { online: running, trips, formsGrid: false, kinetic: 0 };
    const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
    if (s.kind === 'genset') {
      const kva = s.ratingKva ?? s.ratingKw / 0.8;
      const k = rating / s.droopPu;
      const g = s.governor;
      return {
        ...base,
        kind: 'genset',
        formsGrid: true,
        kinetic: (s.inertiaS * kva) / sb,
        state: [p0, 0, 0],
        output: (x) => (g.order === 2 ? clamp(x[0]!, -0.15 * rating, rating) : x[0]!),
        derivative: (x, dw) => {
          const raw = p0 - k * dw + x[2]!;
          const ref = clamp(raw, -0.15 * rating, rating);
          const dz = -s.isochronousGainPuPerS * rating * dw;
          const dzz = (raw >= rating && dz > 0) || (raw <= -0.15 * rating && dz < 0) ? 0 : dz;
          if (g.order === 1)
            return [
              Math.min(
                (ref - x[0]!) / g.timeConstantS,
                s.rampKwPerS ? s.rampKwPerS / sb : Infinity,
              ),
              0,
              dzz,
            ];
          const wn = g.naturalFrequencyRadPerS;
          return [x[1]!, wn * wn * (ref - x[0]!) - 2 * g.dampingRatio * wn * x[1]!, dzz];
        },
      };
    }
    if (s.kind === 'battery') {
      const kva = s.ratingKva ?? s.ratingKw;
      const k = rating / s.droopPu;
      const soc = { value: op.socFraction[i]! };
      const lim = (): [number, number] => [
        soc.value >= s.socMaxFraction ? 0 : -rating,
        soc.value <= s.socMinFraction ? 0 : rating,
      ];
      const e = (s.energyKwh * 3600) / sb;
      if (s.control === 'grid-forming') {
        const h = ((s.virtualInertiaS + s.responseTimeConstantS / (2 * s.droopPu)) * kva) / sb;
        return {
          ...base,
          kind: 'battery',
          formsGrid: true,
          kinetic: h,
          state: [soc.value],
          limits: lim,
          gfOutput: (dw, rocof) => p0 - k * dw - 2 * h * rocof,
          output: () => 0,
          derivative: (x, _dw, _r, p) => {
            soc.value = x[0]!;
            return [-(p > 0 ? p : s.roundTripEfficiency * p) / e];
          },
        };
      }
      const vi = (2 * s.virtualInertiaS * kva) / sb;
      return {
        ...base,
        kind: 'battery',
        state: [p0, soc.value],
        output: (x) => x[0]!,
        derivative: (x, dw, rocof) => {
          soc.value = x[1]!;
          const [lo, hi] = lim();
          const ref = clamp(p0 - k * dw - vi * rocof, lo, hi);
          return [
            (ref - x[0]!) / s.responseTimeConstantS,
            -(x[0]! > 0 ? x[0]! : s.roundTripEfficiency * x[0]!) / e,
          ];
        },
      };
    }
    if (s.kind === 'pv' || s.kind === 'wind') {
      const avail =
        s.kind === 'pv' && s.operation === 'curtailed' ? Math.max(op.availableKw[i]! / sb, p0) : p0;
      const db = (s.kind === 'pv' ? s.overFrequencyDeadbandHz : 0.036) / f0;
      const gain = rating / (s.kind === 'pv' ? s.overFrequencyDroopPu : 0.05);
      const fw = (dw: number) =>
        dw > db
          ? Math.max(0, p0 - gain * (dw - db))
          : dw < -db
            ? Math.min(avail, p0 + gain * (-db - dw))
            : p0;
      if (s.kind === 'pv')
        return {
          ...base,
          kind: 'pv',
          state: [p0],
          output: (x) => x[0]!,
          derivative: (x, dw) => [(fw(dw) - x[0]!) / (s.responseTimeS / Math.log(10))],
        };
      const si = s.syntheticInertia;
      const kva = s.ratingKva ?? s.ratingKw;
      const limit = ((s.rotorInertiaS * kva) / sb) * (1 - s.minRotorSpeedPu ** 2);
      const rotor = { recovering: false, dE: 0, dw: 0 };
      const cap = (si?.capFraction ?? 0) * rating;
      const dterm = (dw: number) =>
        si ? si.droopGainPuPerHz * rating * f0 * Math.max(0, -dw - si.deadbandHz / f0) : 0;
      const kr = si ? si.rocofGainPuPerHzPerS * rating * f0 : 0;
      return {
        ...base,
        kind: 'wind',
        state: [0],
        get kinetic() {
          return rotor.recovering ? 0 : kr / 2;
        },
        gfOutput: (dw, rocof) => {
          rotor.dw = dw;
          if (rotor.recovering)
            return Math.max(0, fw(dw) - Math.min(rotor.dE / (s.recoveryTimeS / 3), cap));
          return fw(dw) + dterm(dw) - kr * rocof;
        },
        limits: (): [number, number] =>
          rotor.recovering
            ? [0, Infinity]
            : [fw(rotor.dw) + Math.min(dterm(rotor.dw), cap), fw(rotor.dw) + cap],
        output: () => 0,
        derivative: (x, dw, _r, p) => {
          rotor.dE = x[0]!;
          if (x[0]! >= limit) rotor.recovering = true;
          return [p - fw(dw)];
        },
      };
    }
    const k = rating / s.droopPu;
    return {
      ...base,
      kind: 'fuelcell',
      state: [p0],
      output: (x) => x[0]!,
      derivative: (x, dw) => [
        Math.min(
          (clamp(p0 - k * dw, 0, rating) - x[0]!) / s.timeConstantS,
          s.rampKwPerS ? s.rampKwPerS / sb : Infinity,
        ),
      ],
    };
  });
  // Momentary cessation: offline at zero output until it ends, then back (like a late start).
  const returnAt = c.sources.map((_, i) => {
    const src = sources[i]!;
    if (!src.online || op.cessationS[i]! <= 0) return Infinity;
    src.online = false;
    if (src.kind !== 'genset' && src.kind !== 'wind' && !src.gfOutput) src.state[0] = 0;
    return op.cessationS[i]!;
  });
  const standby = c.sources.map((s, i) =>
    s.kind === 'genset' &&
    s.operation === 'standby' &&
    op.available[i] === 1 &&
    op.failsToStart[i] === 0
      ? s.startDelayS
      : Infinity,
  );

  // The whole system as one closure over arrays: y = [dw, ...states of every source].
  const rhs = (y: number[]): number[] => {
    const dw = y[0]!;
    let offset = 1;
    const parts = sources.map((s) => {
      const x = y.slice(offset, offset + s.state.length);
      offset += s.state.length;
      return x;
    });
    const pLoad = loads.reduce((a, l) => a + l.p * (1 + l.d * dw), 0);
    const outputs = sources.map((s, i) => (s.online && !s.gfOutput ? s.output(parts[i]!, dw) : 0));
    let kinetic = sources.reduce((a, s) => a + (s.online && !s.gfOutput ? s.kinetic : 0), 0);
    let num = outputs.reduce((a, b) => a + b, 0) - pLoad;
    const gf = sources.map((s, i) => ({ s, i })).filter((g) => g.s.online && g.s.gfOutput);
    const saturated = new Set<number>();
    let rocof = 0;
    for (let pass = 0; pass <= gf.length; pass++) {
      let n = num;
      let kin = kinetic;
      for (const g of gf) {
        if (saturated.has(g.i)) n += outputs[g.i]!;
        else {
          n += g.s.gfOutput!(dw, 0);
          kin += g.s.kinetic;
        }
      }
      rocof = kin > 0 ? n / (2 * kin) : 0;
      let changed = false;
      for (const g of gf) {
        if (saturated.has(g.i)) continue;
        const p = g.s.gfOutput!(dw, rocof);
        const [lo, hi] = g.s.limits!();
        outputs[g.i] = Math.min(hi, Math.max(lo, p));
        if (p > hi || p < lo) {
          saturated.add(g.i);
          changed = true;
        }
      }
      if (!changed) break;
    }
    num = 0;
    kinetic = 0;
    const d = sources.flatMap((s, i) =>
      s.online ? s.derivative(parts[i]!, dw, rocof, outputs[i]!) : parts[i]!.map(() => 0),
    );
    return [rocof, ...d];
  };

  let y = [0, ...sources.flatMap((s) => s.state)];
  const h = 0.005;
  let nadir = 0;
  let shed = 0;
  const stages = c.protection.ufls.map((st) => ({ ...st, since: -1, done: false }));
  const uf = (c.protection.shutdownUnderFrequencyHz ?? (f0 === 50 ? 47.5 : 57)) / f0 - 1;
  const of = (c.protection.shutdownOverFrequencyHz ?? (f0 === 50 ? 52 : 62)) / f0 - 1;
  let ufSince = -1;
  let ofSince = -1;
  const nonCritical = loads.filter((l) => l.tier !== 'critical').reduce((a, l) => a + l.p, 0);
  for (let t = 0; t < horizonS; t += h) {
    const k1 = rhs(y);
    const k2 = rhs(y.map((v, i) => v + (h / 2) * k1[i]!));
    const k3 = rhs(y.map((v, i) => v + (h / 2) * k2[i]!));
    const k4 = rhs(y.map((v, i) => v + h * k3[i]!));
    y = y.map((v, i) => v + (h / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!));
    const dw = y[0]!;
    const now = t + h;
    nadir = Math.min(nadir, dw);
    for (const st of stages) {
      if (st.done) continue;
      if (dw < st.thresholdHz / f0 - 1) {
        if (st.since < 0) st.since = now;
        if (now - st.since >= st.pickupDelayS + st.breakerTimeS) {
          st.done = true;
          shed++;
          let take = st.shareOfLoad * nonCritical;
          for (const tier of ['sheddable', 'essential'])
            for (const l of loads.filter((x) => x.tier === tier)) {
              const dp = Math.min(l.p, take);
              l.p -= dp;
              take -= dp;
            }
        }
      } else st.since = -1;
    }
    sources.forEach((s, i) => {
      if (now >= returnAt[i]!) {
        returnAt[i] = Infinity;
        s.online = true;
      }
      if (now >= standby[i]!) {
        standby[i] = Infinity;
        s.online = true;
      }
      for (const tr of s.trips) {
        if (tr.below ? dw < tr.levelPu : dw > tr.levelPu) {
          if (tr.since < 0) tr.since = now;
          if (now - tr.since >= tr.delayS) s.online = false;
        } else tr.since = -1;
      }
    });
    ufSince = dw < uf ? (ufSince < 0 ? now : ufSince) : -1;
    ofSince = dw > of ? (ofSince < 0 ? now : ofSince) : -1;
    const delay = c.protection.shutdownDelayS;
    const noFormer = !sources.some((s) => s.online && s.formsGrid);
    if (
      (ufSince >= 0 && now - ufSince >= delay) ||
      (ofSince >= 0 && now - ofSince >= delay) ||
      noFormer
    )
      return { nadirHz: f0 * (1 + nadir), shedStages: shed, shutdown: true };
  }
  return { nadirHz: f0 * (1 + nadir), shedStages: shed, shutdown: false };
}
