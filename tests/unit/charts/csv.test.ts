import { afterEach, describe, expect, it, vi } from 'vitest';
import {
  columnsToCsv,
  downloadText,
  fileNameFor,
  rowsToCsv,
  seriesToColumns,
  seriesToCsv,
} from '@/components/charts/csv';

describe('formula injection', () => {
  it.each(['=1+2', '+1', '-1', '@SUM(A1)', '\t=foo', '\r+bar', '=HYPERLINK("http://x","y")'])('neutralises %j', (text) => {
    const cell = rowsToCsv([[text]]).slice(0, -2);
    expect(cell.replace(/^"/, '').startsWith("'")).toBe(true);
  });

  it('turns a leading tab or CR into a space', () => {
    expect(rowsToCsv([['\tfoo', '\rbar']])).toBe('" foo"," bar"\r\n');
  });

  it('leaves ordinary text and numbers alone', () => {
    expect(rowsToCsv([['Hα 656.28', 'a=b', -0.5]])).toBe('Hα 656.28,a=b,-0.5\r\n');
  });
});

describe('cells and rows', () => {
  it('quotes commas and quotes; line breaks inside text become spaces', () => {
    expect(rowsToCsv([['a,b', 'say "hi"', 'two\nlines']])).toBe('"a,b","say ""hi""",two lines\r\n');
  });

  it('writes empty cells for missing values', () => {
    expect(rowsToCsv([[null, undefined, NaN, 1]])).toBe(',,,1\r\n');
  });

  it('strips float noise but keeps real precision', () => {
    expect(rowsToCsv([[0.874 * 100, 656.2812345, -0]])).toBe('87.4,656.2812345,0\r\n');
  });

  it('ends rows with CRLF', () => {
    expect(rowsToCsv([['a', 1], ['b', 2]])).toBe('a,1\r\nb,2\r\n');
  });

  it('pads short columns with blanks', () => {
    const text = columnsToCsv([
      { header: 'x', values: [1, 2, 3] },
      { header: 'y', values: [4] },
    ]);
    expect(text).toBe('x,y\r\n1,4\r\n2,\r\n3,\r\n');
  });
});

describe('series as columns', () => {
  const a = { name: 'Unit A', x: [650, 651], y: [10, 20] };
  const b = { name: 'Unit A cone', x: [650, 651], y: [9, 18] };
  const c = { name: 'Unit B', x: [650.5, 651.5, 652.5], y: [1, 2, 3] };

  it('shares one x column when grids match', () => {
    const cols = seriesToColumns([a, b], 'wavelength (nm)', (n) => `${n} T (%)`);
    expect(cols.map((col) => col.header)).toEqual(['wavelength (nm)', 'Unit A T (%)', 'Unit A cone T (%)']);
    expect(seriesToCsv([a, b], 'wavelength (nm)', (n) => `${n} T (%)`)).toBe(
      'wavelength (nm),Unit A T (%),Unit A cone T (%)\r\n650,10,9\r\n651,20,18\r\n',
    );
  });

  it('groups series by grid, keeping one x column per grid', () => {
    const d = { name: 'Unit B cone', x: [650.5, 651.5, 652.5], y: [0.5, 1.5, 2.5] };
    const cols = seriesToColumns([a, c, b, d], 'wavelength (nm)', (n) => `${n} T (%)`);
    expect(cols.map((col) => col.header)).toEqual([
      'Unit A wavelength (nm)',
      'Unit A T (%)',
      'Unit A cone T (%)',
      'Unit B wavelength (nm)',
      'Unit B T (%)',
      'Unit B cone T (%)',
    ]);
  });

  it('gives each series its own x column when grids differ', () => {
    const cols = seriesToColumns([a, c], 'wavelength (nm)', (n) => `${n} T (%)`);
    expect(cols.map((col) => col.header)).toEqual([
      'Unit A wavelength (nm)',
      'Unit A T (%)',
      'Unit B wavelength (nm)',
      'Unit B T (%)',
    ]);
    expect(columnsToCsv(cols).split('\r\n')[3]).toBe(',,652.5,3');
  });

  it('neutralises hostile series names in headers', () => {
    const text = seriesToCsv([{ name: '=cmd|x', x: [1], y: [2] }], 'x', (n) => n);
    expect(text.split('\r\n')[0]).toBe("x,'=cmd|x");
  });
});

describe('file names', () => {
  it('makes a safe ASCII name from a title', () => {
    expect(fileNameFor('Hα curve: unit #12 / cone f/2.5', 'csv')).toBe('ha-curve-unit-12-cone-f-2-5.csv');
    expect(fileNameFor('   ', 'png')).toBe('bandcone-chart.png');
    expect(fileNameFor('../../etc/passwd', 'csv')).toBe('etc-passwd.csv');
  });
});

describe('downloadText', () => {
  afterEach(() => vi.unstubAllGlobals());

  it('builds the file in the page and clicks a download link', async () => {
    const clicked: { href: string; download: string }[] = [];
    const anchor = {
      href: '',
      download: '',
      rel: '',
      style: {} as Record<string, string>,
      click() {
        clicked.push({ href: this.href, download: this.download });
      },
      remove: vi.fn(),
    };
    vi.stubGlobal('document', { createElement: () => anchor, body: { appendChild: vi.fn() } });
    const blobs: Blob[] = [];
    const revoke = vi.fn();
    vi.stubGlobal('URL', {
      createObjectURL: (b: Blob) => {
        blobs.push(b);
        return 'blob:test';
      },
      revokeObjectURL: revoke,
    });
    downloadText('a.csv', 'x,y\r\n');
    expect(clicked).toEqual([{ href: 'blob:test', download: 'a.csv' }]);
    // The UTF-8 byte-order mark leads, so spreadsheets decode "Hα" correctly.
    const bytes = new Uint8Array(await blobs[0].arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(new TextDecoder().decode(bytes.slice(3))).toBe('x,y\r\n');
    expect(blobs[0].type).toContain('text/csv');
    await new Promise((r) => setTimeout(r, 5));
    expect(revoke).toHaveBeenCalledWith('blob:test');
  });
});
