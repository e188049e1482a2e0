import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import Color from 'color';
import { describe, expect, it } from 'vitest';
import { CLEARANCE_STATES, CLEARANCE_STATE_ICONS, CLEARANCE_STATE_LABELS } from '#shared/domain/clearance.ts';
import { CONSENT_STATE_LABELS } from '#shared/domain/consent.ts';
import { CLEARANCE_TONES } from '#app/components/ui/clearance-badge.tsx';
import { CONSENT_STATE_LOOK } from '#app/components/consent/consent-state.tsx';
import { BADGE_TONES } from '#app/components/ui/status-badge.tsx';

// The contrast figures come from the npm `color` library (its contrast() is the WCAG 2 relative
// luminance ratio), an implementation independent of Plinth's code; the thresholds are WCAG 2.2
// success criteria 1.4.3 (text, 4.5:1) and 1.4.11 (user-interface components and focus, 3:1).
const TEXT_AA = 4.5;
const NON_TEXT_AA = 3;

const css = readFileSync(path.resolve(import.meta.dirname, '../../../app/styles.css'), 'utf8');

/** The colour tokens of the app's @theme block, aliases resolved. */
function themeColours(): Map<string, string> {
  const theme = /@theme[^{]*\{([\s\S]*?)\n\}/.exec(css)?.[1] ?? '';
  const raw = new Map<string, string>();
  for (const m of theme.matchAll(/--color-([a-z0-9-]+):\s*([^;]+);/g)) raw.set(m[1]!, m[2]!.trim());
  const resolved = new Map<string, string>();
  for (const [name, value] of raw) {
    let v = value;
    for (let i = 0; i < 5; i++) {
      const alias = /^var\(--color-([a-z0-9-]+)\)$/.exec(v);
      if (!alias) break;
      v = raw.get(alias[1]!) ?? v;
    }
    resolved.set(name, v);
  }
  return resolved;
}

const colours = themeColours();
function token(name: string): string {
  const value = colours.get(name);
  if (!value) throw new Error(`No colour token --color-${name} in app/styles.css`);
  return value;
}
function ratio(fg: string, bg: string): number {
  return Color(token(fg)).contrast(Color(token(bg)));
}

/** Text colour on background, as the screens pair them. */
const TEXT_PAIRS: [fg: string, bg: string][] = [
  // body text, secondary text and hints on every surface
  ...['graphite-900', 'graphite-800', 'graphite-700', 'graphite-600'].flatMap((fg) => ['white', 'plaster-50', 'plaster-100'].map((bg) => [fg, bg] as [string, string])),
  ['graphite-900', 'plaster-200'],
  // links and quiet buttons
  ['verdigris-800', 'white'],
  ['verdigris-800', 'plaster-50'],
  ['verdigris-800', 'plaster-100'],
  ['verdigris-800', 'verdigris-50'],
  // primary and danger buttons, the skip link
  ['white', 'verdigris-700'],
  ['white', 'verdigris-800'],
  ['white', 'brick-700'],
  ['white', 'brick-800'],
  // the current page in the navigation, the header's acting-as control
  ['verdigris-900', 'verdigris-100'],
  ['verdigris-900', 'verdigris-50'],
  // error and success words
  ['brick-700', 'white'],
  ['brick-700', 'plaster-50'],
  ['brick-700', 'brick-50'],
  ['sage-800', 'white'],
  ['amber-800', 'white'],
  ['amber-800', 'plaster-50'],
];

/** Borders of controls and the focus ring, against the surfaces they sit on. */
const NON_TEXT_PAIRS: [fg: string, bg: string][] = [
  ['graphite-500', 'white'],
  ['graphite-500', 'plaster-50'],
  ['verdigris-900', 'white'],
  ['verdigris-900', 'plaster-50'],
  ['verdigris-900', 'plaster-100'],
  ['verdigris-600', 'white'],
  ['verdigris-700', 'white'],
];

describe('the reference library', () => {
  it('gives the WCAG figures for published examples', () => {
    // WCAG 2 defines black on white as 21:1; WebAIM's contrast checker gives #767676 on white 4.54:1.
    expect(Color('#000000').contrast(Color('#ffffff'))).toBeCloseTo(21, 5);
    expect(Color('#767676').contrast(Color('#ffffff'))).toBeCloseTo(4.54, 2);
  });
});

describe('palette contrast (WCAG 2.2 AA)', () => {
  it.each(TEXT_PAIRS)('text %s on %s reaches 4.5:1', (fg, bg) => {
    expect(ratio(fg, bg)).toBeGreaterThanOrEqual(TEXT_AA);
  });

  it.each(NON_TEXT_PAIRS)('component %s against %s reaches 3:1', (fg, bg) => {
    expect(ratio(fg, bg)).toBeGreaterThanOrEqual(NON_TEXT_AA);
  });

  it.each(Object.entries(BADGE_TONES))('the %s badge (%s) reaches 4.5:1', (_tone, classes) => {
    const bg = /\bbg-([a-z]+-\d+)\b/.exec(classes)?.[1];
    const fg = /\btext-([a-z]+-\d+)\b/.exec(classes)?.[1];
    expect(bg && fg).toBeTruthy();
    expect(ratio(fg!, bg!)).toBeGreaterThanOrEqual(TEXT_AA);
  });

  it('keeps the page background cool, not a warm off-white', () => {
    // A warm off-white has red above blue; plaster white leans the other way.
    const [r, , b] = Color(token('plaster-50')).rgb().array();
    expect(b!).toBeGreaterThanOrEqual(r!);
  });
});

describe('states are told apart by word and shape as well as colour', () => {
  it('gives each clearance state its own word, icon and tone', () => {
    const words = CLEARANCE_STATES.map((s) => CLEARANCE_STATE_LABELS[s]);
    const icons = CLEARANCE_STATES.map((s) => CLEARANCE_STATE_ICONS[s]);
    const tones = CLEARANCE_STATES.map((s) => CLEARANCE_TONES[s]);
    expect(new Set(words).size).toBe(5);
    expect(new Set(icons).size).toBe(5);
    expect(new Set(tones).size).toBe(5);
    // Untested must never look like Cleared: a silence an artist could read as "no problem".
    expect(CLEARANCE_TONES.untested).not.toBe(CLEARANCE_TONES.cleared);
  });

  it('gives each consent state its own word, icon and tone', () => {
    const states = Object.keys(CONSENT_STATE_LOOK) as (keyof typeof CONSENT_STATE_LOOK)[];
    expect(new Set(states.map((s) => CONSENT_STATE_LABELS[s])).size).toBe(states.length);
    expect(new Set(states.map((s) => CONSENT_STATE_LOOK[s].icon)).size).toBe(states.length);
    expect(new Set(states.map((s) => CONSENT_STATE_LOOK[s].tone)).size).toBe(states.length);
  });
});

describe('every colour the screens name is in the palette', () => {
  const appDir = path.resolve(import.meta.dirname, '../../../app');
  const sources = (readdirSync(appDir, { recursive: true, withFileTypes: true }) as import('node:fs').Dirent[])
    .filter((d) => d.isFile() && /\.tsx?$/.test(d.name))
    .map((d) => path.join(d.parentPath, d.name));
  const used = new Map<string, string>();
  for (const file of sources) {
    const text = readFileSync(file, 'utf8');
    for (const m of text.matchAll(/\b(?:bg|text|border(?:-[trblxy])?|ring|outline|divide|fill|stroke|decoration|placeholder|accent|from|to|via)-([a-z]+-\d{2,3})\b/g)) {
      if (!used.has(m[1]!)) used.set(m[1]!, path.relative(appDir, file));
    }
  }

  it('finds the screens’ colour classes', () => {
    // A guard on the scan itself: the shell's body text colour is among them.
    expect(used.has('ink-900') || used.has('graphite-900')).toBe(true);
  });

  it.each([...used])('%s (first used in %s) is a token of app/styles.css', (name) => {
    expect(colours.has(name), `--color-${name}`).toBe(true);
  });
});
