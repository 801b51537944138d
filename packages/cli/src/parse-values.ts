/** Parsing of option values given as text, with one clear sentence per bad value (UsageError). */
import { GNSS_SYSTEMS, isGnssSystem, type GnssSystem } from '@refdelta/core';
import { UsageError } from './usage-error.js';

/** A finite number, optionally within [min, max]. */
export function parseNumber(option: string, value: unknown, min = -Infinity, max = Infinity): number {
  const x = typeof value === 'number' ? value : typeof value === 'string' && value.trim() !== '' ? Number(value) : NaN;
  if (!Number.isFinite(x)) throw new UsageError(`--${option} expects a number${typeof value === 'number' ? '' : `, got '${String(value)}'`}`);
  if (x < min || x > max) throw new UsageError(`--${option} must be between ${min} and ${max}, got ${x}`);
  return x;
}

/** Comma-separated numbers, exactly `count` of them. */
export function parseNumberList(option: string, value: unknown, count: number, what: string): number[] {
  const text = String(value ?? '');
  const parts = text.split(',').map((s) => s.trim());
  const xs = parts.map(Number);
  if (parts.length !== count || parts.some((p) => p === '') || xs.some((x) => !Number.isFinite(x))) {
    throw new UsageError(`--${option} expects ${what} (${count} comma-separated numbers), got '${text}'`);
  }
  return xs;
}

/** System letters 'G,R,E' (or 'GRE'). */
export function parseSystems(value: unknown): GnssSystem[] {
  const text = String(value ?? '').toUpperCase().replace(/[\s,]+/g, '');
  const out: GnssSystem[] = [];
  for (const c of text) {
    if (!isGnssSystem(c)) throw new UsageError(`--systems expects letters among ${GNSS_SYSTEMS.join(',')}, got '${String(value)}'`);
    if (!out.includes(c)) out.push(c);
  }
  if (out.length === 0) throw new UsageError(`--systems expects at least one system letter (${GNSS_SYSTEMS.join(',')})`);
  return out;
}

/** One word from a fixed list. */
export function parseChoice<T extends string>(option: string, value: unknown, choices: readonly T[]): T {
  const v = String(value ?? '').trim().toLowerCase();
  const hit = choices.find((c) => c === v);
  if (!hit) throw new UsageError(`--${option} expects one of ${choices.join(', ')}, got '${String(value)}'`);
  return hit;
}

/** A comma-separated subset of a fixed list. */
export function parseChoiceList<T extends string>(option: string, value: unknown, choices: readonly T[]): T[] {
  const parts = String(value ?? '').split(',').map((s) => s.trim().toLowerCase()).filter((s) => s !== '');
  if (parts.length === 0) throw new UsageError(`--${option} expects a comma-separated list of ${choices.join(', ')}`);
  const out: T[] = [];
  for (const p of parts) {
    const hit = choices.find((c) => c === p);
    if (!hit) throw new UsageError(`--${option}: '${p}' is not one of ${choices.join(', ')}`);
    if (!out.includes(hit)) out.push(hit);
  }
  return out;
}
