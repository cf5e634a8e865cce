import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { iou } from '../../src/analysis/detect-text.js';
import type { Label } from '../../src/analysis/labels.js';
import { InputError } from '../../src/errors.js';
import { labelsFromSvg } from '../../src/io/read-svg-text.js';

describe('labels from an SVG export (SVG 1.1 text, transforms and viewBox)', () => {
  test.each(['ferry-console', 'picker-headset', 'calibration-chart'])('the %s sample scene\'s text layer gives its drawn labels: boxes IoU ≥ 0.85, capital heights within 2 % (measured from the bundled face; our scenes)', (name) => {
    const truth = JSON.parse(readFileSync(`sample-scenes/${name}.labels.json`, 'utf8')).labels as Label[];
    const svg = readFileSync(`sample-scenes/${name}.text.svg`, 'utf8');
    const [, w, h] = /width="(\d+)" height="(\d+)"/.exec(svg)!.map(Number);
    const got = labelsFromSvg(svg, `${name}.text.svg`, w, h);
    expect(got.map((l) => l.id)).toEqual(truth.map((l) => l.id));
    for (const t of truth) {
      const g = got.find((l) => l.id === t.id)!;
      expect(g.text).toBe(t.text);
      expect(g.role).toBe(t.role);
      expect(iou(t.boxPx, g.boxPx), t.id).toBeGreaterThanOrEqual(0.85);
      expect(Math.abs(g.letterHeightPx / t.letterHeightPx - 1), t.id).toBeLessThanOrEqual(0.02);
    }
  });

  test('a face eyeproof does not have is estimated: capitals 0.7 em (common practice), or the ratio given', () => {
    const svg = '<svg viewBox="0 0 100 50"><text x="10" y="30" font-family="Other Sans" font-size="20">Hello</text></svg>';
    expect(labelsFromSvg(svg, 'a.svg', 100, 50)[0].letterHeightPx).toBeCloseTo(14, 6);
    expect(labelsFromSvg(svg, 'a.svg', 100, 50, { capHeightRatios: { 'other sans': 0.66 } })[0].letterHeightPx).toBeCloseTo(13.2, 6);
  });

  test('an @2x export\'s viewBox, group transforms, text-anchor, tspans and data-role are followed', () => {
    const svg = `<svg width="200" height="100" viewBox="0 0 200 100">
      <g transform="translate(20 10)" font-family="IBM Plex Sans" font-size="10">
        <text id="a" x="0" y="20" data-role="glance">AB</text>
        <text id="b" x="100" y="20" text-anchor="end" style="font-size: 20px">CD</text>
        <text id="c" x="0" y="60">first<tspan x="0" y="80">second line</tspan></text>
      </g></svg>`;
    const one = labelsFromSvg(svg, 'x.svg', 200, 100);
    const two = labelsFromSvg(svg, 'x.svg', 400, 200);
    expect(one.map((l) => l.id)).toEqual(['a', 'b', 'c', 'c']);
    expect(one[0].role).toBe('glance');
    expect(one[3].text).toBe('second line');
    // Anchored at its end: the box ends at x = 120.
    expect(one[1].boxPx[0] + one[1].boxPx[2]).toBeCloseTo(120, 0);
    // Capitals of a 20 px font are twice those of a 10 px one (within the face's pixel rounding).
    expect(Math.abs(one[1].letterHeightPx / one[0].letterHeightPx / 2 - 1)).toBeLessThan(0.08);
    for (let i = 0; i < one.length; i++) {
      expect(Math.abs(two[i].letterHeightPx / one[i].letterHeightPx / 2 - 1)).toBeLessThan(0.08);
      expect(two[i].boxPx[0]).toBeCloseTo(2 * one[i].boxPx[0], 0);
    }
  });

  test('rotated text and text turned into outlines are refused with a way forward', () => {
    expect(() => labelsFromSvg('<svg><text transform="rotate(30)" x="1" y="1">A</text></svg>', 'r.svg', 10, 10)).toThrow(/cannot follow/);
    expect(() => labelsFromSvg('<svg><path d="M0 0L1 1"/></svg>', 'o.svg', 10, 10)).toThrow(/no <text> elements/);
    expect(() => labelsFromSvg('<svg><text', 'b.svg', 10, 10)).toThrow(InputError);
  });
});
