/// <reference types="node" />
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';

// Read as a file: the test run does not process CSS, so a `?raw` import would come back empty.
const css = readFileSync(`${import.meta.dirname}/../index.css`, 'utf8');

/**
 * Relative luminance of an sRGB colour as WCAG 2.1 defines it ("relative luminance", Understanding
 * and glossary of WCAG 2.1): each channel linearised with the 0.03928 threshold, /12.92 below it,
 * ((c + 0.055) / 1.055)^2.4 above, then L = 0.2126 R + 0.7152 G + 0.0722 B.
 */
function relativeLuminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((at) => {
    const c = parseInt(hex.slice(at, at + 2), 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}

/** WCAG 2.1 contrast ratio: (L1 + 0.05) / (L2 + 0.05), the lighter colour's luminance as L1. */
function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}

/** The tokens as index.css defines them: `--color-NAME: light-dark(#light, #dark);`. */
function themeTokens(): Record<'light' | 'dark', Record<string, string>> {
  const tokens = { light: {} as Record<string, string>, dark: {} as Record<string, string> };
  const pattern = /--color-([a-z]+):\s*light-dark\(\s*(#[0-9a-f]{6})\s*,\s*(#[0-9a-f]{6})\s*\)/gi;
  for (const [, name, light, dark] of css.matchAll(pattern)) {
    tokens.light[name!] = light!;
    tokens.dark[name!] = dark!;
  }
  return tokens;
}

// Every text colour the screens set on every background it sits on: `text-FG` inside `bg-BG`.
const TEXT_ON_BACKGROUND = [
  ['ink', 'paper'],
  ['ink', 'panel'],
  ['muted', 'paper'],
  ['muted', 'panel'],
  ['over', 'paper'], // error messages
  ['over', 'panel'],
  ['barink', 'bar'], // the header
  ['paper', 'steel'], // strong buttons
  ['paper', 'go'], // verdict blocks
  ['paper', 'under'],
  ['paper', 'over'],
  ['ink', 'brass'], // active area, settling, notices
] as const;

// WCAG 2.1 success criterion 1.4.3 Contrast (Minimum), level AA: at least 4.5:1 for normal text.
const MIN_TEXT_CONTRAST = 4.5;

describe('bench theme colours', () => {
  const tokens = themeTokens();

  it('defines every token in both themes', () => {
    const names = [
      'ink',
      'paper',
      'panel',
      'line',
      'steel',
      'brass',
      'go',
      'under',
      'over',
      'muted',
      'bar',
      'barink',
    ];
    expect(Object.keys(tokens.light).sort()).toEqual([...names].sort());
    expect(Object.keys(tokens.dark).sort()).toEqual([...names].sort());
  });

  it('computes the contrast ratio as WCAG 2.1 does', () => {
    // Black on white is 21:1 and a colour on itself 1:1, the two ends of the WCAG scale.
    expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrastRatio('#777777', '#777777')).toBe(1);
    // #767676 on white is about 4.54:1 (a value from memory; it follows from the formula above).
    expect(contrastRatio('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
  });

  for (const theme of ['light', 'dark'] as const) {
    it.each(TEXT_ON_BACKGROUND)(`${theme}: text-%s on bg-%s reaches 4.5:1`, (fg, bg) => {
      const ratio = contrastRatio(tokens[theme][fg]!, tokens[theme][bg]!);
      expect(ratio).toBeGreaterThanOrEqual(MIN_TEXT_CONTRAST);
    });
  }
});
