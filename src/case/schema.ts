/**
 * The case file: one microgrid, its protection, its events and the Monte Carlo settings.
 *
 * This zod schema is the single source of truth: the TypeScript types (`Case`, `Source`, ...),
 * the validation of case files and the JSON Schema printed by `holdfast schema` all come from it.
 * Every dimensional key carries its unit (`ratingKw`, `inertiaS`, `droopPu`). Defaults name their
 * source in the description; "from memory" marks a value recalled but not confirmed.
 * Cross-field rules (ids unique, buses exist, thresholds ordered, ...) live in `rules.ts`.
 */
import { z } from 'zod';

const finite = () => z.number().finite();
const positive = () => finite().positive();
const nonNegative = () => finite().nonnegative();
const fraction = () => finite().min(0).max(1);
const id = () =>
  z
    .string()
    .regex(/^[A-Za-z][A-Za-z0-9_.-]{0,63}$/, 'an id: a letter, then letters, digits, _ . -');

// ---------------------------------------------------------------------------------------------
// Distributions (units come from the key that holds one, e.g. `durationH`)
// ---------------------------------------------------------------------------------------------

export const distributionSchema = z
  .discriminatedUnion('kind', [
    z.strictObject({ kind: z.literal('fixed'), value: finite() }),
    z.strictObject({ kind: z.literal('uniform'), min: finite(), max: finite() }),
    z.strictObject({ kind: z.literal('normal'), mean: finite(), sd: nonNegative() }),
    z.strictObject({
      kind: z.literal('lognormal'),
      mean: positive().describe('arithmetic mean of the variable'),
      sigmaLn: nonNegative().describe('standard deviation of ln(variable)'),
    }),
    z.strictObject({
      kind: z.literal('weibull'),
      shape: positive().describe('Weibull shape k'),
      scale: positive().describe('Weibull scale c, in the unit of the key'),
    }),
    z.strictObject({
      kind: z.literal('beta'),
      alpha: positive(),
      beta: positive(),
      min: finite().default(0),
      max: finite().default(1),
    }),
    z.strictObject({
      kind: z.literal('empirical'),
      values: z.array(finite()).min(1),
      weights: z.array(nonNegative()).optional().describe('relative weights; equal if omitted'),
    }),
  ])
  .describe('a probability distribution; the unit is that of the key holding it');
export type Distribution = z.output<typeof distributionSchema>;

// ---------------------------------------------------------------------------------------------
// Profiles: an 8760-hour CSV next to the case, or a parametric model (the sampler defines them)
// ---------------------------------------------------------------------------------------------

export const csvProfileSchema = z.strictObject({
  kind: z.literal('csv'),
  file: z.string().min(1).describe('path relative to the case file; 8760 rows, one value per hour'),
  column: z
    .union([z.string().min(1), z.number().int().nonnegative()])
    .default(0)
    .describe('column name (header row) or 0-based index'),
});

export const loadShapeSchema = z.strictObject({
  kind: z.literal('parametric'),
  dailyShape: z
    .array(nonNegative())
    .length(24)
    .optional()
    .describe(
      '24 hourly multipliers of the peak (local time); a default office-and-homes shape if omitted',
    ),
  weekendFactor: positive().default(0.85).describe('multiplier on Saturdays and Sundays'),
  seasonalSwingFraction: fraction()
    .default(0.15)
    .describe('amplitude of the yearly cosine swing, as a fraction of the peak'),
  peakDayOfYear: z.number().int().min(1).max(365).default(200).describe('day of the seasonal peak'),
  forecastErrorSd: fraction()
    .default(0.05)
    .describe('relative standard deviation of the hourly draw'),
});

export const loadProfileSchema = z.discriminatedUnion('kind', [csvProfileSchema, loadShapeSchema]);

export const solarModelSchema = z.strictObject({
  kind: z.literal('parametric'),
  latitudeDeg: finite().min(-66).max(66),
  longitudeDeg: finite().min(-180).max(180).default(0),
  timeZoneHours: finite().min(-12).max(14).default(0),
  tiltDeg: finite().min(0).max(90).default(20),
  azimuthDeg: finite()
    .min(-180)
    .max(180)
    .default(0)
    .describe(
      'surface azimuth, 0 = facing the equator, west positive (Duffie & Beckman convention)',
    ),
  clearnessByMonth: z
    .array(fraction())
    .length(12)
    .optional()
    .describe('mean clearness index per month (12 values); a temperate default if omitted'),
  temperatureCoefficientPerC: finite()
    .default(-0.004)
    .describe('power temperature coefficient, 1/degC (from memory, typical crystalline Si)'),
});

export const windModelSchema = z.strictObject({
  kind: z.literal('parametric'),
  weibullShapeByMonth: z.array(positive()).length(12).optional(),
  weibullScaleMPerSByMonth: z
    .array(positive())
    .length(12)
    .describe('Weibull scale at the reference height, m/s'),
  referenceHeightM: positive().default(10),
  hubHeightM: positive().default(80),
  shearExponent: finite()
    .min(0)
    .max(0.6)
    .default(1 / 7)
    .describe('power-law exponent; 1/7 classic onshore (REFERENCES 8.6)'),
});

// ---------------------------------------------------------------------------------------------
// Protection shared by sources
// ---------------------------------------------------------------------------------------------

export const unitTripSchema = z
  .strictObject({
    underFrequencyHz: positive()
      .optional()
      .describe('trip below this frequency after underFrequencyDelayS'),
    underFrequencyDelayS: nonNegative()
      .default(2)
      .describe(
        'time below underFrequencyHz before the trip, s (seconds for small gensets, from memory)',
      ),
    overFrequencyHz: positive()
      .optional()
      .describe('trip above this frequency after overFrequencyDelayS'),
    overFrequencyDelayS: nonNegative()
      .default(2)
      .describe('time above overFrequencyHz before the trip, s'),
    rocofHzPerS: positive().optional().describe('trip when |RoCoF| exceeds this for rocofDelayS'),
    rocofDelayS: nonNegative()
      .default(0.5)
      .describe('time above the RoCoF setting before the trip, s'),
  })
  .describe('unit protection (ANSI 81U/81O/81R); omitted settings never trip');

const rideThroughCategory = z
  .enum(['I', 'II', 'III'])
  .describe('IEEE 1547-2018 abnormal-performance category');

const commonSource = {
  id: id().describe('unique id of the source (letters, digits, _ . -); used by --set and outputs'),
  bus: id().describe('id of the bus the source connects to'),
  forcedOutageRate: fraction()
    .default(0.02)
    .describe('probability of being out on forced outage at any hour (IEEE 762 FOR)'),
  failurePerHour: nonNegative()
    .default(0)
    .describe('running failure rate during the outage, 1/h (constant hazard)'),
  maintenance: z
    .array(z.strictObject({ startHour: z.number().int().min(0).max(8759), durationH: positive() }))
    .default([])
    .describe('planned maintenance windows (hour of year), unavailable inside them'),
};

// ---------------------------------------------------------------------------------------------
// Sources
// ---------------------------------------------------------------------------------------------

export const gensetSchema = z.strictObject({
  ...commonSource,
  kind: z.literal('genset'),
  fuel: z
    .enum(['diesel', 'gas'])
    .default('diesel')
    .describe('diesel (fuel in L) or gas engine (m3)'),
  ratingKw: positive().describe('active-power rating, kW'),
  ratingKva: positive()
    .optional()
    .describe('apparent-power rating; ratingKw / 0.8 if omitted (common practice, no source)'),
  inertiaS: positive().describe(
    'inertia constant H on the kVA rating, s (0.5-2 s for small engines, from memory)',
  ),
  droopPu: finite()
    .min(0.005)
    .max(0.2)
    .default(0.05)
    .describe('governor droop R, pu (5 % typical)'),
  governor: z
    .discriminatedUnion('order', [
      z.strictObject({
        order: z.literal(1),
        timeConstantS: positive().default(0.5).describe('combined actuator and engine lag Tg, s'),
      }),
      z.strictObject({
        order: z.literal(2),
        naturalFrequencyRadPerS: positive().describe(
          'undamped natural frequency of the engine response',
        ),
        dampingRatio: finite().min(0.05).max(2).describe('below 1 the unit overshoots'),
      }),
    ])
    .default({ order: 1, timeConstantS: 0.5 }),
  isochronousGainPuPerS: nonNegative()
    .default(0)
    .describe('integral (secondary) gain, pu power per pu frequency per s; 0 = pure droop'),
  swingDampingPu: nonNegative()
    .max(200)
    .default(20)
    .describe(
      'electrical damping of the rotor swing against other sources (damper windings), pu power per pu speed on the kVA rating; used by the small-signal check. 20 is a moderate damper-winding value (from memory): 2 is a low classical-model value that flags nearly every genset as poorly damped, while Saadat Example 11.2 implies about 52 for a large machine (REFERENCES 1.3d). Confirm for the machine.',
    ),
  rampKwPerS: positive().optional().describe('upward ramp limit; unlimited if omitted'),
  minLoadingFraction: fraction()
    .default(0.3)
    .describe('minimum loading, fraction of rating (common practice, no source)'),
  operation: z
    .enum(['running', 'standby'])
    .default('running')
    .describe('running while grid-connected, or standby: started only after separation'),
  gridConnectedLoadingFraction: fraction()
    .default(0.5)
    .describe('output while grid-connected, fraction of rating (running units)'),
  startDelayS: nonNegative()
    .default(10)
    .describe('standby: from separation to ready to close (NFPA 110 Type 10 = 10 s)'),
  failToStartProbability: fraction()
    .default(0.0135)
    .describe('standby: per start (IEEE 493 Gold Book, from memory)'),
  fuelTankL: positive()
    .optional()
    .describe('usable fuel (L for diesel, m3 for gas); unlimited if omitted'),
  fuelNoLoadLPerH: nonNegative().optional().describe('fuel at zero load (Willans line intercept)'),
  fuelFullLoadLPerH: positive().optional().describe('fuel at rated load'),
  reversePowerFraction: fraction()
    .default(0.1)
    .describe('reverse-power trip threshold, fraction of rating (from memory)'),
  reversePowerDelayS: nonNegative()
    .default(2)
    .describe('reverse-power trip delay, s (from memory)'),
  trips: unitTripSchema.default({
    underFrequencyDelayS: 2,
    overFrequencyDelayS: 2,
    rocofDelayS: 0.5,
  }),
  reactiveKvarMax: positive().optional().describe('reactive limit; 0.6 of kVA rating if omitted'),
  voltageDroopPu: finite()
    .min(0)
    .max(0.2)
    .default(0.04)
    .describe('Q-V droop, pu voltage per pu reactive power'),
});

export const batterySchema = z.strictObject({
  ...commonSource,
  kind: z.literal('battery'),
  ratingKw: positive().describe('inverter active-power rating, kW'),
  ratingKva: positive().optional().describe('inverter apparent-power rating; ratingKw if omitted'),
  energyKwh: positive().describe('usable energy capacity at 100 % state of charge, kWh'),
  control: z
    .enum(['grid-forming', 'grid-following'])
    .default('grid-forming')
    .describe(
      'grid-forming holds voltage and frequency itself; grid-following needs another source',
    ),
  droopPu: finite()
    .min(0.005)
    .max(0.2)
    .default(0.02)
    .describe('P-f droop, pu (2 %, from memory; IEEE 1547-2018 allows 2-5 % for DER)'),
  virtualInertiaS: nonNegative()
    .default(0)
    .describe('emulated inertia constant on the kVA rating, s'),
  responseTimeConstantS: positive()
    .default(0.05)
    .describe('inverter power loop lag, s (tens of ms, from memory)'),
  socMinFraction: fraction()
    .default(0.1)
    .describe('lowest state of charge the battery management allows (common practice, no source)'),
  socMaxFraction: fraction()
    .default(0.95)
    .describe('highest state of charge the battery management allows (common practice, no source)'),
  socReserveFraction: fraction().default(0.3).describe('kept for islanding while grid-connected'),
  socAtEvent: distributionSchema
    .optional()
    .describe('state of charge at separation (fraction); reserve plus a beta spread if omitted'),
  socByHourOfDay: z
    .array(fraction())
    .length(24)
    .optional()
    .describe(
      'time-of-day pattern: state of charge at separation for each hour 0-23 (local time); replaces socAtEvent',
    ),
  roundTripEfficiency: finite()
    .gt(0)
    .max(1)
    .default(0.88)
    .describe('AC round-trip efficiency (about 0.85-0.9 for Li-ion, from memory)'),
  gridConnectedMode: z
    .enum(['idle', 'charge-to-max', 'peak-shave', 'self-consume'])
    .default('idle')
    .describe(
      'what the battery does while grid-connected (sets its output and charge at separation)',
    ),
  rideThrough: rideThroughCategory.default('II'),
  seamlessTransfer: z
    .boolean()
    .default(true)
    .describe(
      'grid-forming batteries: holds the island voltage through the separation (seamless transfer, as islanding-capable storage is specified), so the dip does not trip it or make it cease; false applies its rideThrough category like any inverter source (common practice, no source)',
    ),
  reactiveKvarMax: positive().optional(),
  voltageDroopPu: finite()
    .min(0)
    .max(0.2)
    .default(0.04)
    .describe('Q-V droop, pu voltage per pu reactive power'),
  trips: unitTripSchema.optional().describe('IEEE 1547-2018 Table 18 defaults if omitted'),
});

export const pvSchema = z.strictObject({
  ...commonSource,
  kind: z.literal('pv'),
  ratingKw: positive().describe('AC rating'),
  ratingKva: positive().optional(),
  operation: z
    .enum(['mppt', 'curtailed'])
    .default('mppt')
    .describe(
      'mppt: all available power, no upward reserve; curtailed: holds headroomFraction back',
    ),
  headroomFraction: fraction().default(0).describe('curtailed: reserve held below available power'),
  overFrequencyDeadbandHz: nonNegative()
    .default(0.036)
    .describe('IEEE 1547-2018 default (Table 24, from memory)'),
  overFrequencyDroopPu: finite()
    .min(0.02)
    .max(0.1)
    .default(0.05)
    .describe('IEEE 1547-2018 default 5 %'),
  responseTimeS: positive()
    .default(5)
    .describe('open-loop response time (IEEE 1547-2018 default 5 s)'),
  rideThrough: rideThroughCategory.default('II'),
  resource: z
    .discriminatedUnion('kind', [csvProfileSchema, solarModelSchema])
    .describe('capacity factor profile or solar model'),
  powerFactor: finite().min(0.5).max(1).default(1).describe('operating power factor'),
  trips: unitTripSchema
    .optional()
    .describe('unit trips; protection.inverterTrips, else IEEE 1547-2018 Table 18, if omitted'),
});

export const windSchema = z.strictObject({
  ...commonSource,
  kind: z.literal('wind'),
  ratingKw: positive(),
  ratingKva: positive().optional(),
  rotorInertiaS: positive()
    .default(4)
    .describe('rotor inertia constant on the rating, s (from memory)'),
  syntheticInertia: z
    .strictObject({
      rocofGainPuPerHzPerS: nonNegative()
        .default(0)
        .describe('extra power per Hz/s of falling frequency, pu of rating'),
      droopGainPuPerHz: nonNegative()
        .default(0)
        .describe('extra power per Hz of deviation, pu of rating'),
      capFraction: fraction()
        .default(0.1)
        .describe('cap on extra power, fraction of rating (about 10 %, from memory)'),
      deadbandHz: nonNegative().default(0.1),
    })
    .optional()
    .describe('omit for no frequency support'),
  minRotorSpeedPu: finite()
    .min(0.3)
    .max(1)
    .default(0.7)
    .describe('synthetic inertia stops at this rotor speed (about 0.7 pu, from memory)'),
  recoveryTimeS: positive()
    .default(20)
    .describe('time to restore the rotor speed after support ends'),
  cutInMPerS: positive()
    .default(3.5)
    .describe('hub-height wind speed where output starts (from memory)'),
  ratedMPerS: positive().default(12).describe('wind speed of rated output (from memory)'),
  cutOutMPerS: positive().default(25).describe('wind speed where the turbine stops (from memory)'),
  rideThrough: rideThroughCategory.default('II'),
  resource: z.discriminatedUnion('kind', [csvProfileSchema, windModelSchema]),
  powerFactor: finite().min(0.5).max(1).default(1),
  trips: unitTripSchema.optional(),
});

export const fuelCellSchema = z.strictObject({
  ...commonSource,
  kind: z.literal('fuelcell'),
  ratingKw: positive(),
  ratingKva: positive().optional(),
  timeConstantS: positive().default(5).describe('fuel-processor lag, s (from memory)'),
  rampKwPerS: positive().optional(),
  droopPu: finite().min(0.005).max(0.2).default(0.05),
  gridConnectedLoadingFraction: fraction().default(0.8),
  fuelKwh: positive().optional().describe('stored fuel as electrical energy; unlimited if omitted'),
  rideThrough: rideThroughCategory.default('II'),
  trips: unitTripSchema.optional(),
});

export const sourceSchema = z.discriminatedUnion('kind', [
  gensetSchema,
  batterySchema,
  pvSchema,
  windSchema,
  fuelCellSchema,
]);

export type Genset = z.output<typeof gensetSchema>;
export type Battery = z.output<typeof batterySchema>;
export type Pv = z.output<typeof pvSchema>;
export type Wind = z.output<typeof windSchema>;
export type FuelCell = z.output<typeof fuelCellSchema>;
export type Source = z.output<typeof sourceSchema>;
export type SourceKind = Source['kind'];

// ---------------------------------------------------------------------------------------------
// Loads, network, protection, events, Monte Carlo
// ---------------------------------------------------------------------------------------------

export const loadTiers = ['critical', 'essential', 'sheddable'] as const;
export type LoadTier = (typeof loadTiers)[number];

export const loadSchema = z.strictObject({
  id: id(),
  bus: id(),
  tier: z.enum(loadTiers).describe('critical is never shed by UFLS; sheddable goes first'),
  peakKw: positive().describe('yearly peak demand of this load, kW (profiles scale it)'),
  powerFactor: finite()
    .min(0.5)
    .max(1)
    .default(0.95)
    .describe('lagging power factor (common practice, no source)'),
  kvarPerKw: nonNegative()
    .max(10)
    .optional()
    .describe(
      'reactive demand per active demand (Q/P, lagging positive); overrides powerFactor, e.g. for published feeders with loads below 0.5 power factor',
    ),
  frequencySensitivityPu: nonNegative()
    .default(1)
    .describe('load damping D: % power per % frequency (1-2 typical, from memory)'),
  voltageExponentP: nonNegative()
    .default(1)
    .describe('P ~ V^a (0 constant power, 1 current, 2 impedance)'),
  voltageExponentQ: nonNegative().default(2).describe('Q ~ V^b (2: constant impedance)'),
  profile: loadProfileSchema.default({
    kind: 'parametric',
    weekendFactor: 0.85,
    seasonalSwingFraction: 0.15,
    peakDayOfYear: 200,
    forecastErrorSd: 0.05,
  }),
});
export type Load = z.output<typeof loadSchema>;

export const busSchema = z.strictObject({
  id: id(),
  baseKv: positive().optional().describe('line-to-line base; the system voltage if omitted'),
});

export const branchSchema = z
  .strictObject({
    id: id().optional(),
    from: id().describe('bus id at the sending end (towards the pcc)'),
    to: id().describe('bus id at the receiving end'),
    rOhm: nonNegative().optional().describe('series resistance, ohm'),
    xOhm: nonNegative().optional().describe('series reactance, ohm'),
    rPu: nonNegative().optional().describe('series resistance, pu of the system base'),
    xPu: nonNegative().optional().describe('series reactance, pu of the system base'),
    ratingA: positive().optional().describe('thermal rating, A'),
    closed: z.boolean().default(true).describe('false for a normally open point (no connection)'),
  })
  .describe('series impedance in ohms or in pu of the system base (one pair, not both)');

export const networkSchema = z.strictObject({
  buses: z.array(busSchema).min(1),
  branches: z.array(branchSchema).default([]),
  pccBus: id().describe('point of common coupling with the utility'),
});
export type Network = z.output<typeof networkSchema>;

export const sheddingStageSchema = z.strictObject({
  thresholdHz: positive().describe('stage operates below this frequency'),
  pickupDelayS: nonNegative()
    .default(0.1)
    .describe('relay pickup (6 cycles at 60 Hz ~ 0.1 s, ERCOT NOGRR247)'),
  breakerTimeS: nonNegative()
    .default(0.05)
    .describe('breaker opening time (3 cycles, common practice, no source)'),
  shareOfLoad: fraction().describe(
    'fraction of the non-critical load this stage sheds (sheddable first, then essential)',
  ),
});
export type SheddingStage = z.output<typeof sheddingStageSchema>;

export const protectionSchema = z.strictObject({
  ufls: z
    .array(sheddingStageSchema)
    .default([])
    .describe('under-frequency load shedding stages, highest threshold first'),
  shutdownUnderFrequencyHz: positive()
    .optional()
    .describe('island collapses below this for shutdownDelayS; 57 Hz / 47.5 Hz if omitted'),
  shutdownOverFrequencyHz: positive().optional().describe('62 Hz / 52 Hz if omitted'),
  shutdownDelayS: nonNegative()
    .default(0.5)
    .describe('time outside the shutdown limits before the island collapses, s (from memory)'),
  inverterTrips: unitTripSchema
    .optional()
    .describe('default trip settings of inverter sources; IEEE 1547-2018 Table 18 if omitted'),
});

export const eventsSchema = z.strictObject({
  islandingRatePerYear: positive().describe('utility outages that island the microgrid, per year'),
  monthlyRateWeights: z
    .array(nonNegative())
    .length(12)
    .optional()
    .describe('relative event rate per month (storm seasons); uniform if omitted'),
  outageDurationH: distributionSchema.describe('how long the grid stays away, hours'),
  dipRetainedPu: distributionSchema
    .default({ kind: 'uniform', min: 0.2, max: 0.9 })
    .describe('retained voltage at the PCC during the fault before separation, pu'),
  dipDurationS: distributionSchema.default({ kind: 'uniform', min: 0.08, max: 0.5 }),
});

export const limitsSchema = z.strictObject({
  voltageBand: z
    .enum(['ansi-c84.1-range-a', 'ansi-c84.1-range-b', 'en50160-island', 'custom'])
    .optional()
    .describe('ANSI C84.1 Range A for 60 Hz, EN 50160 island rows for 50 Hz if omitted'),
  voltageMinPu: positive().optional().describe('custom lower voltage limit, pu'),
  voltageMaxPu: positive().optional().describe('custom upper voltage limit, pu'),
  frequencyMinHz: positive()
    .optional()
    .describe('frequency violation below this; the first UFLS-free band if omitted'),
  frequencyMaxHz: positive().optional().describe('frequency violation above this'),
  rocofMaxHzPerS: positive()
    .optional()
    .describe('RoCoF violation above this (IEEE 1547-2018 Table 21: 0.5 / 2 / 3 Hz/s by category)'),
  dampingRatioMin: fraction()
    .default(0.05)
    .describe('flag oscillatory modes below this (5 %, common practice)'),
  loadingMarginMin: finite()
    .min(1)
    .default(1.2)
    .describe('flag loadability margins below this load factor'),
});

export const monteCarloSchema = z.strictObject({
  scenarios: z
    .number()
    .int()
    .positive()
    .max(1e9)
    .default(10000)
    .describe('separation events to sample'),
  seed: z
    .union([z.number().int(), z.string().min(1)])
    .default(1)
    .describe('root of every random stream; the same seed gives the same rows'),
  confidenceLevel: finite()
    .gt(0.5)
    .lt(1)
    .default(0.95)
    .describe('level of the confidence intervals'),
  plan: z
    .enum(['plain', 'stratified-month', 'stratified-month-hour', 'latin-hypercube'])
    .default('plain')
    .describe('how scenarios are spread over the year and the inputs'),
  horizonS: positive().max(3600).default(60).describe('frequency-event horizon, s'),
  rocofWindowS: positive().max(2).default(0.1).describe('window over which RoCoF is measured, s'),
  energyStepH: positive().max(1).default(1).describe('time step of the outage energy balance, h'),
  failureDefinition: z
    .enum(['shutdown-or-critical-loss', 'shutdown-only'])
    .default('shutdown-or-critical-loss')
    .describe('what counts as a failure in failures_per_year'),
});

export const systemSchema = z.strictObject({
  frequencyHz: z.union([z.literal(50), z.literal(60)]).describe('nominal frequency, 50 or 60 Hz'),
  voltageKv: positive().describe('nominal line-to-line voltage of the main bus, kV'),
  baseKva: positive().describe('power base for per-unit quantities, kVA'),
  blackStartAllowed: z.boolean().default(false).describe('may the island restart after a shutdown'),
  blackStartDelayH: nonNegative().default(1).describe('time to restart after a shutdown, h'),
});

export const caseSchema = z.strictObject({
  name: z.string().min(1).describe('name of the microgrid, shown in summaries and reports'),
  description: z.string().default('').describe('free text'),
  invented: z.boolean().default(false).describe('true for made-up demo data'),
  system: systemSchema,
  sources: z.array(sourceSchema).min(1),
  loads: z.array(loadSchema).min(1),
  network: networkSchema,
  protection: protectionSchema.default({ ufls: [], shutdownDelayS: 0.5 }),
  events: eventsSchema,
  limits: limitsSchema.default({ dampingRatioMin: 0.05, loadingMarginMin: 1.2 }),
  monteCarlo: monteCarloSchema.default({
    scenarios: 10000,
    seed: 1,
    confidenceLevel: 0.95,
    plan: 'plain',
    horizonS: 60,
    rocofWindowS: 0.1,
    energyStepH: 1,
    failureDefinition: 'shutdown-or-critical-loss',
  }),
});

/** A validated case with every default filled in. */
export type Case = z.output<typeof caseSchema>;
/** A case as written in the file (defaults optional). */
export type CaseInput = z.input<typeof caseSchema>;
