import { describe, expect, it } from 'vitest';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { StripPlot } from '@/components/charts/strip-plot';

const count = (html: string, tag: string) => html.split(`<${tag} `).length - 1;

describe('the unit spread strip', () => {
  it('draws a dot per unit for a few units', () => {
    const html = renderToStaticMarkup(createElement(StripPlot, { values: [656.1, 656.3, 656.4, 656.9], label: 'CWL' }));
    expect(count(html, 'circle')).toBe(4);
    expect(html).toContain('4 values');
  });

  it('keeps a popular label’s strip small: at most 60 dots in at most 4 lanes, statistics over every unit', () => {
    const values = Array.from({ length: 500 }, (_, i) => 656 + (i % 50) * 0.01);
    const html = renderToStaticMarkup(createElement(StripPlot, { values, label: 'CWL', height: 64 }));
    expect(count(html, 'circle')).toBe(60);
    expect(html).toContain('500 values (dots for 60 of them, at even quantiles)');
    // mean of 656 + 0.01·(0…49), each 10 times: 656.245 (closed form)
    expect(html).toMatch(/mean 656\.2[45]/);
    const cys = [...html.matchAll(/cy="([\d.-]+)"/g)].map((m) => Number(m[1]));
    expect(Math.min(...cys)).toBeGreaterThanOrEqual(0); // no dot climbs out of the picture
  });
});
