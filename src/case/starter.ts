/**
 * The commented starter case `holdfast init` writes: small, valid, invented, with a comment on
 * every section saying what it is and which keys exist. Kept valid by a test
 * (test/cli/init.test.ts validates it).
 */
export function starterCaseYaml(): string {
  return `# holdfast starter case: INVENTED place and numbers, for illustration only.
# Edit it to describe your microgrid, then run:  holdfast check <this file>
# Every dimensional key carries its unit in its name (ratingKw, inertiaS, droopPu, delayS).
# For an editor that completes and checks keys:  holdfast schema > case.schema.json
# Results are screening estimates; protection settings and interconnection are decided under
# local codes by licensed engineers.

name: Starter island (invented)
description: A small invented 60 Hz island grid to start from.
invented: true

system:
  frequencyHz: 60          # 50 or 60
  voltageKv: 4.16          # nominal line-to-line voltage of the main bus
  baseKva: 2000            # power base of per-unit quantities

# Sources: kind genset | battery | pv | wind | fuelcell; each has an id, a bus and a forced outage rate.
sources:
  - id: gen1
    kind: genset
    fuel: diesel
    bus: plant
    ratingKw: 800
    inertiaS: 1.2            # H on the kVA rating (ratingKw / 0.8 unless ratingKva is given)
    droopPu: 0.05            # 5 % governor droop
    governor: { order: 1, timeConstantS: 0.5 }
    operation: running       # running while grid-connected, or standby (starts after separation)
    gridConnectedLoadingFraction: 0.5
    fuelTankL: 6000
    fuelNoLoadLPerH: 16
    fuelFullLoadLPerH: 210
    forcedOutageRate: 0.03
  - id: gen2
    kind: genset
    bus: plant
    ratingKw: 800
    inertiaS: 1.2
    operation: standby
    startDelayS: 10          # NFPA 110 Type 10
    failToStartProbability: 0.0135
    fuelTankL: 6000
    fuelNoLoadLPerH: 16
    fuelFullLoadLPerH: 210
  - id: bess
    kind: battery
    bus: plant
    ratingKw: 500
    energyKwh: 1000
    control: grid-forming
    droopPu: 0.02
    virtualInertiaS: 2
    socMinFraction: 0.1
    socReserveFraction: 0.4  # kept for islanding while grid-connected
    socMaxFraction: 0.95
  - id: pv1
    kind: pv
    bus: feeder-end
    ratingKw: 600
    resource: { kind: parametric, latitudeDeg: 21, longitudeDeg: -158, timeZoneHours: -10 }

# Loads by tier: critical (never shed), essential, sheddable (shed first).
loads:
  - { id: clinic, bus: plant, tier: critical, peakKw: 250 }
  - { id: town, bus: feeder-mid, tier: essential, peakKw: 450 }
  - { id: pumps, bus: feeder-end, tier: sheddable, peakKw: 300 }

# Network: buses, branches (rOhm/xOhm or rPu/xPu), the point of common coupling.
network:
  pccBus: plant
  buses: [{ id: plant }, { id: feeder-mid }, { id: feeder-end }]
  branches:
    - { id: line1, from: plant, to: feeder-mid, rOhm: 0.35, xOhm: 0.45 }
    - { id: line2, from: feeder-mid, to: feeder-end, rOhm: 0.40, xOhm: 0.50 }

# Protection: UFLS stages (highest threshold first, shares of the non-critical load).
protection:
  ufls:
    - { thresholdHz: 59.3, shareOfLoad: 0.2 }
    - { thresholdHz: 58.9, shareOfLoad: 0.2 }
    - { thresholdHz: 58.5, shareOfLoad: 0.3 }
  shutdownUnderFrequencyHz: 57
  shutdownOverFrequencyHz: 62
  shutdownDelayS: 0.5

# Events: how often the utility is lost, and for how long (hours).
events:
  islandingRatePerYear: 2
  outageDurationH: { kind: lognormal, mean: 3, sigmaLn: 1 }

monteCarlo:
  scenarios: 10000
  seed: 1
  confidenceLevel: 0.95
`;
}
