/**
 * Writes the INVENTED hourly profiles of the Tern Atoll demo case: load.csv (fractions of each
 * load's peakKw, one column per load), pv.csv and wind.csv (fractions of the rating). 8760 rows
 * after a header, hour 0 = 1 January 00:00. The shapes are simple made-up formulas with a fixed
 * pseudo-random wobble (xorshift32, seed 2026), so running it again gives the same bytes:
 *
 *   npx tsx cases/tern-atoll/make-profiles.ts
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const hours = 8760;

// xorshift32 (Marsaglia, "Xorshift RNGs", J. Stat. Softw. 8(14), 2003): deterministic wobble only
let state = 2026;
function uniform(): number {
  state ^= state << 13;
  state ^= state >>> 17;
  state ^= state << 5;
  state >>>= 0;
  return state / 4294967296;
}

const round = (v: number) => Math.max(0, Math.min(1, v)).toFixed(4);
const load: string[] = ['hour,village,resort'];
const pv: string[] = ['hour,capacity_factor'];
const wind: string[] = ['hour,capacity_factor'];
let windState = 0.4;
for (let h = 0; h < hours; h++) {
  const hourOfDay = h % 24;
  const day = Math.floor(h / 24);
  const season = Math.cos((2 * Math.PI * (day - 30)) / 365); // invented: peak in late January
  const evening = Math.exp(-((hourOfDay - 19) ** 2) / 8);
  const midday = Math.exp(-((hourOfDay - 13) ** 2) / 18);
  const village = 0.45 + 0.35 * evening + 0.12 * midday + 0.05 * season + 0.04 * (uniform() - 0.5);
  const resort = 0.55 + 0.25 * midday + 0.1 * evening + 0.12 * season + 0.04 * (uniform() - 0.5);
  load.push(`${h},${round(village)},${round(resort)}`);
  const sun = hourOfDay >= 6 && hourOfDay <= 18 ? Math.sin((Math.PI * (hourOfDay - 6)) / 12) : 0;
  const cloud = 0.65 + 0.35 * uniform();
  pv.push(`${h},${round(0.82 * sun * cloud * (0.95 + 0.05 * season))}`);
  // a slowly wandering capacity factor (AR(1)-like), stronger in the trade-wind months
  windState = 0.97 * windState + 0.03 * (0.35 + 0.2 * season) + 0.06 * (uniform() - 0.5);
  wind.push(`${h},${round(windState)}`);
}
writeFileSync(join(here, 'load.csv'), `${load.join('\n')}\n`);
writeFileSync(join(here, 'pv.csv'), `${pv.join('\n')}\n`);
writeFileSync(join(here, 'wind.csv'), `${wind.join('\n')}\n`);
