/**
 * Cross-field rules of a case that the schema alone cannot express: ids unique, references to
 * buses resolve, state-of-charge limits ordered, shedding thresholds descending and below
 * nominal, shares summing to at most one, a grid-forming source present, branch impedances given
 * in one unit system, wind speeds ordered, distributions sane, fuel curves rising, the network
 * connected. Each returns problems (never throws), so validation reports every problem at once.
 * Paths are JSON-pointer-like (`/sources/2/socMinFraction`).
 */
import type { CaseProblem } from '../errors.js';
import { defaultShutdownLimitsHz } from '../grid/frequency/protection.js';
import type { Case, Distribution } from './schema.js';

type Problems = CaseProblem[];

function uniqueIds(
  list: readonly { id?: string | undefined }[],
  base: string,
  what: string,
  out: Problems,
) {
  const first = new Map<string, number>();
  list.forEach((item, i) => {
    if (item.id === undefined) return;
    const seen = first.get(item.id);
    if (seen !== undefined)
      out.push({
        path: `${base}/${i}/id`,
        message: `expected a ${what} id not used before, got ${JSON.stringify(item.id)} (also ${base}/${seen}/id)`,
      });
    else first.set(item.id, i);
  });
}

function busReferences(c: Case, out: Problems) {
  const buses = new Set(c.network.buses.map((b) => b.id));
  const known = [...buses].slice(0, 8).join(', ');
  const check = (bus: string, path: string) => {
    if (!buses.has(bus))
      out.push({
        path,
        message: `expected the id of a bus in network.buses (${known}), got ${JSON.stringify(bus)}`,
      });
  };
  c.sources.forEach((s, i) => {
    check(s.bus, `/sources/${i}/bus`);
  });
  c.loads.forEach((l, i) => {
    check(l.bus, `/loads/${i}/bus`);
  });
  c.network.branches.forEach((b, i) => {
    check(b.from, `/network/branches/${i}/from`);
    check(b.to, `/network/branches/${i}/to`);
    if (b.from === b.to)
      out.push({
        path: `/network/branches/${i}/to`,
        message: `expected a bus other than from (${JSON.stringify(b.from)}), got the same bus`,
      });
  });
  check(c.network.pccBus, '/network/pccBus');
}

function branchImpedance(c: Case, out: Problems) {
  c.network.branches.forEach((b, i) => {
    const path = `/network/branches/${i}`;
    const ohm = b.rOhm !== undefined || b.xOhm !== undefined;
    const pu = b.rPu !== undefined || b.xPu !== undefined;
    if (ohm && pu) {
      out.push({
        path,
        message: 'expected the impedance in ohms (rOhm, xOhm) or in pu (rPu, xPu), got both',
      });
      return;
    }
    if (!ohm && !pu) {
      out.push({
        path,
        message: 'expected an impedance: rOhm and xOhm, or rPu and xPu, got neither',
      });
      return;
    }
    const [r, x, rKey, xKey] = ohm
      ? [b.rOhm, b.xOhm, 'rOhm', 'xOhm']
      : [b.rPu, b.xPu, 'rPu', 'xPu'];
    if (r === undefined)
      out.push({
        path: `${path}/${rKey}`,
        message: `expected ${rKey} beside ${xKey} (0 if negligible), got nothing`,
      });
    if (x === undefined)
      out.push({
        path: `${path}/${xKey}`,
        message: `expected ${xKey} beside ${rKey} (0 if negligible), got nothing`,
      });
    if (r === 0 && x === 0)
      out.push({
        path,
        message: 'expected a non-zero impedance (a zero branch is one bus), got r = x = 0',
      });
  });
}

/** Every bus reachable from the pcc over closed branches (breadth-first search). */
function connectivity(c: Case, out: Problems) {
  const buses = new Set(c.network.buses.map((b) => b.id));
  if (!buses.has(c.network.pccBus)) return; // reported by busReferences
  const neighbours = new Map<string, string[]>();
  for (const b of c.network.branches) {
    if (!b.closed) continue;
    neighbours.set(b.from, [...(neighbours.get(b.from) ?? []), b.to]);
    neighbours.set(b.to, [...(neighbours.get(b.to) ?? []), b.from]);
  }
  const reached = new Set([c.network.pccBus]);
  const queue = [c.network.pccBus];
  for (let q = queue.shift(); q !== undefined; q = queue.shift()) {
    for (const n of neighbours.get(q) ?? []) {
      if (!reached.has(n)) {
        reached.add(n);
        queue.push(n);
      }
    }
  }
  c.network.buses.forEach((b, i) => {
    if (!reached.has(b.id))
      out.push({
        path: `/network/buses/${i}`,
        message: `expected bus ${JSON.stringify(b.id)} to be reachable from the pcc bus ${JSON.stringify(c.network.pccBus)} over closed branches, got no path`,
      });
  });
}

function gridForming(c: Case, out: Problems) {
  const gensets = c.sources.filter((s) => s.kind === 'genset');
  const formingBatteries = c.sources.filter(
    (s) => s.kind === 'battery' && s.control === 'grid-forming',
  );
  if (gensets.length === 0 && formingBatteries.length === 0) {
    out.push({
      path: '/sources',
      message:
        'expected at least one grid-forming source (a genset, or a battery with control: grid-forming), got none',
    });
    return;
  }
  const runningSynchronous = gensets.some((g) => g.kind === 'genset' && g.operation === 'running');
  if (!runningSynchronous && formingBatteries.length === 0)
    out.push({
      path: '/sources',
      message:
        'expected a grid-forming battery: no genset runs at separation (all standby), so the island has no inertia until one starts, got none',
    });
}

function frequencies(c: Case, out: Problems) {
  const f0 = c.system.frequencyHz;
  let previous = Number.POSITIVE_INFINITY;
  let share = 0;
  const under = c.protection.shutdownUnderFrequencyHz;
  // the frequency engine's default when the case gives none (src/grid/frequency/protection.ts)
  const collapseHz = under ?? defaultShutdownLimitsHz(f0).underHz;
  c.protection.ufls.forEach((stage, i) => {
    const path = `/protection/ufls/${i}/thresholdHz`;
    if (stage.thresholdHz >= f0)
      out.push({
        path,
        message: `expected a threshold below the nominal ${f0} Hz, got ${stage.thresholdHz}`,
      });
    if (stage.thresholdHz >= previous)
      out.push({
        path,
        message: `expected a threshold below the previous stage's ${previous} Hz (highest first), got ${stage.thresholdHz}`,
      });
    if (stage.thresholdHz <= collapseHz)
      out.push({
        path,
        message: `expected a threshold above the shutdown limit (${collapseHz} Hz${under === undefined ? ', the default' : ''}): a stage below it never acts, got ${stage.thresholdHz}`,
      });
    previous = stage.thresholdHz;
    share += stage.shareOfLoad;
  });
  if (share > 1 + 1e-9)
    out.push({
      path: '/protection/ufls',
      message: `expected shareOfLoad to sum to at most 1 (100 %), got ${+share.toFixed(6)}`,
    });
  const over = c.protection.shutdownOverFrequencyHz;
  if (under !== undefined && under >= f0)
    out.push({
      path: '/protection/shutdownUnderFrequencyHz',
      message: `expected a frequency below the nominal ${f0} Hz, got ${under}`,
    });
  if (over !== undefined && over <= f0)
    out.push({
      path: '/protection/shutdownOverFrequencyHz',
      message: `expected a frequency above the nominal ${f0} Hz, got ${over}`,
    });
  const trips: [string, Case['protection']['inverterTrips']][] = [
    ['/protection/inverterTrips', c.protection.inverterTrips],
  ];
  c.sources.forEach((s, i) => {
    trips.push([`/sources/${i}/trips`, s.trips]);
  });
  for (const [path, t] of trips) {
    if (t?.underFrequencyHz !== undefined && t.underFrequencyHz >= f0)
      out.push({
        path: `${path}/underFrequencyHz`,
        message: `expected a frequency below the nominal ${f0} Hz, got ${t.underFrequencyHz}`,
      });
    if (t?.overFrequencyHz !== undefined && t.overFrequencyHz <= f0)
      out.push({
        path: `${path}/overFrequencyHz`,
        message: `expected a frequency above the nominal ${f0} Hz, got ${t.overFrequencyHz}`,
      });
  }
  const l = c.limits;
  if (l.frequencyMinHz !== undefined && l.frequencyMinHz >= f0)
    out.push({
      path: '/limits/frequencyMinHz',
      message: `expected a frequency below the nominal ${f0} Hz, got ${l.frequencyMinHz}`,
    });
  if (l.frequencyMaxHz !== undefined && l.frequencyMaxHz <= f0)
    out.push({
      path: '/limits/frequencyMaxHz',
      message: `expected a frequency above the nominal ${f0} Hz, got ${l.frequencyMaxHz}`,
    });
  if (l.voltageMinPu !== undefined && l.voltageMinPu >= 1)
    out.push({
      path: '/limits/voltageMinPu',
      message: `expected a voltage below 1 pu, got ${l.voltageMinPu}`,
    });
  if (l.voltageMaxPu !== undefined && l.voltageMaxPu <= 1)
    out.push({
      path: '/limits/voltageMaxPu',
      message: `expected a voltage above 1 pu, got ${l.voltageMaxPu}`,
    });
  if (l.voltageBand === 'custom' && (l.voltageMinPu === undefined || l.voltageMaxPu === undefined))
    out.push({
      path: '/limits/voltageBand',
      message:
        'expected voltageMinPu and voltageMaxPu with voltageBand: custom, got at least one missing',
    });
}

interface Support {
  min: number;
  max: number;
  what: string;
}

/** Checks a distribution's own parameters and that its values stay inside `support`. */
export function distributionProblems(d: Distribution, path: string, support: Support): Problems {
  const out: Problems = [];
  const outside = (v: number) => v < support.min || v > support.max;
  const range = `${support.what} (${support.min} to ${support.max})`;
  switch (d.kind) {
    case 'fixed':
      if (outside(d.value))
        out.push({ path: `${path}/value`, message: `expected ${range}, got ${d.value}` });
      break;
    case 'uniform':
      if (d.min > d.max)
        out.push({ path: `${path}/min`, message: `expected min <= max (${d.max}), got ${d.min}` });
      if (outside(d.min) || outside(d.max))
        out.push({
          path,
          message: `expected min and max within ${range}, got ${d.min} to ${d.max}`,
        });
      break;
    case 'beta':
      if (d.min >= d.max)
        out.push({ path: `${path}/min`, message: `expected min < max (${d.max}), got ${d.min}` });
      if (outside(d.min) || outside(d.max))
        out.push({
          path,
          message: `expected min and max within ${range}, got ${d.min} to ${d.max}`,
        });
      break;
    case 'empirical': {
      if (d.weights !== undefined) {
        if (d.weights.length !== d.values.length)
          out.push({
            path: `${path}/weights`,
            message: `expected one weight per value (${d.values.length}), got ${d.weights.length}`,
          });
        else if (!(d.weights.reduce((a, b) => a + b, 0) > 0))
          out.push({
            path: `${path}/weights`,
            message: 'expected weights with a positive sum, got all zero',
          });
      }
      const bad = d.values.findIndex(outside);
      if (bad >= 0)
        out.push({
          path: `${path}/values/${bad}`,
          message: `expected ${range}, got ${d.values[bad]}`,
        });
      break;
    }
    case 'normal':
    case 'lognormal':
    case 'weibull':
      // unbounded above (and normal below): acceptable only where the support is unbounded
      if (d.kind === 'normal' && support.min > Number.NEGATIVE_INFINITY)
        out.push({
          path: `${path}/kind`,
          message: `expected a distribution that stays within ${range} (lognormal, weibull, uniform, beta, empirical), got normal`,
        });
      if (support.max < Number.POSITIVE_INFINITY)
        out.push({
          path: `${path}/kind`,
          message: `expected a bounded distribution within ${range} (fixed, uniform, beta, empirical), got ${d.kind}`,
        });
      break;
  }
  return out;
}

function distributions(c: Case, out: Problems) {
  const e = c.events;
  out.push(
    ...distributionProblems(e.outageDurationH, '/events/outageDurationH', {
      min: 0,
      max: Number.POSITIVE_INFINITY,
      what: 'a duration in hours',
    }),
  );
  out.push(
    ...distributionProblems(e.dipRetainedPu, '/events/dipRetainedPu', {
      min: 0,
      max: 1.2,
      what: 'a retained voltage in pu',
    }),
  );
  out.push(
    ...distributionProblems(e.dipDurationS, '/events/dipDurationS', {
      min: 0,
      max: 60,
      what: 'a dip duration in s',
    }),
  );
  if (e.monthlyRateWeights && !(e.monthlyRateWeights.reduce((a, b) => a + b, 0) > 0))
    out.push({
      path: '/events/monthlyRateWeights',
      message: 'expected weights with a positive sum, got all zero',
    });
  c.sources.forEach((s, i) => {
    if (s.kind === 'battery' && s.socAtEvent)
      out.push(
        ...distributionProblems(s.socAtEvent, `/sources/${i}/socAtEvent`, {
          min: 0,
          max: 1,
          what: 'a state of charge',
        }),
      );
  });
}

function sourceRules(c: Case, out: Problems) {
  c.sources.forEach((s, i) => {
    const path = `/sources/${i}`;
    if (s.ratingKva !== undefined && s.ratingKva < s.ratingKw)
      out.push({
        path: `${path}/ratingKva`,
        message: `expected at least ratingKw (${s.ratingKw}), got ${s.ratingKva}`,
      });
    if (s.kind === 'battery') {
      if (!(s.socMinFraction < s.socReserveFraction))
        out.push({
          path: `${path}/socReserveFraction`,
          message: `expected more than socMinFraction (${s.socMinFraction}), got ${s.socReserveFraction}`,
        });
      if (!(s.socReserveFraction <= s.socMaxFraction))
        out.push({
          path: `${path}/socReserveFraction`,
          message: `expected at most socMaxFraction (${s.socMaxFraction}), got ${s.socReserveFraction}`,
        });
      if (!(s.socMinFraction < s.socMaxFraction))
        out.push({
          path: `${path}/socMinFraction`,
          message: `expected less than socMaxFraction (${s.socMaxFraction}), got ${s.socMinFraction}`,
        });
    }
    if (s.kind === 'wind') {
      if (!(s.cutInMPerS < s.ratedMPerS))
        out.push({
          path: `${path}/cutInMPerS`,
          message: `expected less than ratedMPerS (${s.ratedMPerS}), got ${s.cutInMPerS}`,
        });
      if (!(s.ratedMPerS < s.cutOutMPerS))
        out.push({
          path: `${path}/ratedMPerS`,
          message: `expected less than cutOutMPerS (${s.cutOutMPerS}), got ${s.ratedMPerS}`,
        });
    }
    if (s.kind === 'genset') {
      if (
        s.fuelNoLoadLPerH !== undefined &&
        s.fuelFullLoadLPerH !== undefined &&
        !(s.fuelFullLoadLPerH > s.fuelNoLoadLPerH)
      )
        out.push({
          path: `${path}/fuelFullLoadLPerH`,
          message: `expected more than fuelNoLoadLPerH (${s.fuelNoLoadLPerH}), got ${s.fuelFullLoadLPerH}`,
        });
      if (s.fuelTankL !== undefined && s.fuelFullLoadLPerH === undefined)
        out.push({
          path: `${path}/fuelFullLoadLPerH`,
          message:
            'expected the full-load consumption when fuelTankL is given (the tank runs out by it), got nothing',
        });
    }
    if (s.kind === 'pv' && s.operation === 'curtailed' && s.headroomFraction === 0)
      out.push({
        path: `${path}/headroomFraction`,
        message: 'expected a headroom above 0 for operation: curtailed, got 0',
      });
  });
}

/** Every cross-field problem of a schema-valid case (empty when the case is sound). */
export function crossFieldProblems(c: Case): Problems {
  const out: Problems = [];
  uniqueIds(c.sources, '/sources', 'source', out);
  uniqueIds(c.loads, '/loads', 'load', out);
  uniqueIds(c.network.buses, '/network/buses', 'bus', out);
  uniqueIds(c.network.branches, '/network/branches', 'branch', out);
  busReferences(c, out);
  branchImpedance(c, out);
  connectivity(c, out);
  gridForming(c, out);
  frequencies(c, out);
  distributions(c, out);
  sourceRules(c, out);
  return out;
}
