// Display units: the stored setup is in s, eV, V; the screen shows ns, MeV/keV, kV where a person reads them.

/** Compact number for the screen: 4 significant digits, exponent only for very large or small values. */
export function fmt(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return x > 0 ? '∞' : x < 0 ? '−∞' : '—';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e6) return String(Number(x.toPrecision(digits)));
  return x.toExponential(digits - 1).replace('e+', 'e');
}

/** A unit: label and the factor to multiply a stored value by to get the displayed one. */
export interface Unit {
  label: string;
  /** displayed = stored × toDisplay */
  toDisplay: number;
}

/** Nanoseconds. */
export const NS: Unit = { label: 'ns', toDisplay: 1e9 };
/** Megaelectronvolts. */
export const MEV: Unit = { label: 'MeV', toDisplay: 1e-6 };
/** Kiloelectronvolts. */
export const KEV: Unit = { label: 'keV', toDisplay: 1e-3 };

/** MeV for spreads above 1 MeV, keV below: keeps axis numbers readable. */
export function energyUnit(maxAbsEv: number): Unit {
  return maxAbsEv >= 1e6 ? MEV : KEV;
}

/** Time as ns, µs or ms. */
export function fmtTime(s: number): string {
  if (!Number.isFinite(s)) return '—';
  const a = Math.abs(s);
  if (a < 1e-6) return `${fmt(s * 1e9)} ns`;
  if (a < 1e-3) return `${fmt(s * 1e6)} µs`;
  if (a < 1) return `${fmt(s * 1e3)} ms`;
  return `${fmt(s)} s`;
}

/** Energy as eV, keV, MeV or GeV. */
export function fmtEnergy(ev: number): string {
  if (!Number.isFinite(ev)) return '—';
  const a = Math.abs(ev);
  if (a < 1e3) return `${fmt(ev)} eV`;
  if (a < 1e6) return `${fmt(ev / 1e3)} keV`;
  if (a < 1e9) return `${fmt(ev / 1e6)} MeV`;
  return `${fmt(ev / 1e9)} GeV`;
}

/** Frequency as Hz, kHz, MHz. */
export function fmtFreq(hz: number): string {
  if (!Number.isFinite(hz)) return '—';
  const a = Math.abs(hz);
  if (a < 1e3) return `${fmt(hz)} Hz`;
  if (a < 1e6) return `${fmt(hz / 1e3)} kHz`;
  return `${fmt(hz / 1e6)} MHz`;
}

/** The next of 1, 2, 5 × 10^k at or above x (x > 0): axis ends that grow in steps a reader follows. */
export function niceAbove(x: number): number {
  const p = 10 ** Math.floor(Math.log10(x));
  for (const m of [1, 2, 5, 10]) if (m * p >= x) return m * p;
  return 10 * p;
}
