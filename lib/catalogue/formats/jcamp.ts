/**
 * One curve as JCAMP-DX 4.24 (R. S. McDonald & P. A. Wilks, "JCAMP-DX: A
 * Standard Form for Exchange of Infrared Spectra in Computer Readable Form",
 * Applied Spectroscopy 42 (1988) 151–162), the plain-text exchange form that
 * lab spectroscopy software reads.
 *
 *   ##TITLE= … ##JCAMP-DX= 4.24 ##DATA TYPE= UV/VIS SPECTRUM ##ORIGIN= ##OWNER=   (required core)
 *   ##XUNITS= NANOMETERS ##YUNITS= TRANSMITTANCE ##XFACTOR= ##YFACTOR=
 *   ##FIRSTX= ##LASTX= ##NPOINTS= ##FIRSTY=                                      (actual values)
 *   ##XYDATA=(X++(Y..Y))   evenly spaced: each line is X/XFACTOR of its first Y, then Y/YFACTOR values,
 *                          the i-th Y lying at FIRSTX + i·DELTAX, DELTAX = (LASTX − FIRSTX)/(NPOINTS − 1)
 *   ##XYPOINTS=(XY..XY)    otherwise: one X,Y pair per line
 *   ##END=
 *
 * Labels are ASCII, one per line, at most 80 characters a line; our own labels
 * start with ##$ as the standard reserves for user-defined ones, and $$ opens a
 * comment, so text taken from users is flattened to one line of ASCII without
 * "$$" before it is written.
 */

import { issuedDate, numOf, textOf, type CurveRecord } from './record';

const LINE_MAX = 80;
/** Transmission is written as integers of this unit in XYDATA: 1e-7 keeps 7 decimals of a 0–1 fraction. */
export const JCAMP_YFACTOR = 1e-7;
/** Samples count as evenly spaced when each lies within this fraction of a step of FIRSTX + i·DELTAX. */
const EVEN_TOLERANCE = 1e-4;

/** User text as one line of printable ASCII without "$$" (accents dropped, other characters as '?'). */
export function jcampText(s: string, max = LINE_MAX): string {
  const plain = s.normalize('NFKD');
  let out = '';
  for (const ch of plain) {
    const c = ch.codePointAt(0)!;
    if (c >= 0x300 && c <= 0x36f) continue; // combining accents left by NFKD
    if (c === 0x0a || c === 0x0d || c === 0x09) out += ' ';
    else if (c >= 0x20 && c < 0x7f) out += ch;
    else out += '?';
  }
  while (out.includes('$$')) out = out.split('$$').join('$ $');
  out = out.trim();
  return out.length > max ? `${out.slice(0, max - 3)}...` : out;
}

function ldr(label: string, value: string): string {
  const head = `##${label}=`;
  return `${head} ${jcampText(value, LINE_MAX - head.length - 1)}`;
}

/** Shortest decimal text of a double (what String() gives); AFFN writes an exponent with a capital E. */
const num = (v: number) => String(v).replace('e', 'E');

function evenStep(x: number[]): number | null {
  const n = x.length;
  if (n < 2) return null;
  const dx = (x[n - 1] - x[0]) / (n - 1);
  if (!(dx > 0)) return null;
  for (let i = 0; i < n; i++) if (Math.abs(x[i] - (x[0] + i * dx)) > EVEN_TOLERANCE * dx) return null;
  return dx;
}

function yymmdd(date: string): string {
  return `${date.slice(2, 4)}/${date.slice(5, 7)}/${date.slice(8, 10)}`;
}

export function toJcamp(r: CurveRecord): string {
  const { wavelengthNm: x, transmission: y } = r.points;
  const n = x.length;
  const m = r.method;
  const out: string[] = [];
  const unit = r.serial ? ` unit ${r.serial}` : '';
  out.push(ldr('TITLE', `Bandcone curve ${r.id} revision ${r.revision}: ${r.label}${unit}`));
  out.push('##JCAMP-DX= 4.24');
  out.push('##DATA TYPE= UV/VIS SPECTRUM');
  out.push(ldr('ORIGIN', [r.lab, r.contributor].filter(Boolean).join(', ') || 'Bandcone contributor'));
  out.push(ldr('OWNER', r.licence === 'CC0-1.0' ? 'PUBLIC DOMAIN (CC0-1.0)' : `${r.contributor ?? 'Anonymous contributor'}, licence ${r.licence}`));
  const measured = r.measuredOn ?? issuedDate(r);
  out.push(`##DATE= ${yymmdd(measured)}`);
  out.push(ldr('SPECTROMETER/DATA SYSTEM', r.instrument));
  const res = numOf(m.resolutionNm);
  if (res !== undefined) out.push(`##RESOLUTION= ${num(res)}`);
  const temp = numOf(m.temperatureC);
  if (temp !== undefined) out.push(`##TEMPERATURE= ${num(temp)}`);
  out.push(ldr('SAMPLE DESCRIPTION', `interference filter ${r.label}${r.maker ? ` by ${r.maker}` : ''}`));
  out.push(ldr('SOURCE REFERENCE', r.url));
  out.push(`##$BANDCONE CURVE= ${r.id}`);
  out.push(`##$REVISION= ${r.revision}`);
  out.push(ldr('$STATUS', r.status));
  if (r.measuredOn) out.push(`##$MEASURED ON= ${r.measuredOn}`);
  if (r.verifiedAt) out.push(`##$VERIFIED ON= ${r.verifiedAt.slice(0, 10)}`);
  out.push(ldr('$LICENCE', r.licence));
  out.push(`##$AOI DEG= ${num(r.aoiDeg)}`);
  const beam = textOf(m.beam);
  if (beam) out.push(ldr('$BEAM', beam === 'converging' && numOf(m.beamFNumber) ? `converging f/${num(numOf(m.beamFNumber)!)}` : beam));
  const pol = textOf(m.polarization);
  if (pol) out.push(ldr('$POLARIZATION', pol));
  if (r.derived.cwlNm !== null) out.push(`##$CWL NM= ${num(r.derived.cwlNm)}`);
  if (r.derived.fwhmNm !== null) out.push(`##$FWHM NM= ${num(r.derived.fwhmNm)}`);
  out.push('$$ wavelength in nm, standard air; transmittance as a fraction 0-1');
  out.push('##XUNITS= NANOMETERS');
  out.push('##YUNITS= TRANSMITTANCE');

  let minY = Infinity;
  let maxY = -Infinity;
  for (const v of y) {
    if (v < minY) minY = v;
    if (v > maxY) maxY = v;
  }
  const dx = evenStep(x);
  if (dx !== null) {
    out.push('##XFACTOR= 1');
    out.push(`##YFACTOR= ${num(JCAMP_YFACTOR)}`);
    out.push(`##FIRSTX= ${num(x[0])}`, `##LASTX= ${num(x[n - 1])}`, `##DELTAX= ${num(dx)}`);
    out.push(`##MAXY= ${num(maxY)}`, `##MINY= ${num(minY)}`, `##NPOINTS= ${n}`, `##FIRSTY= ${num(y[0])}`);
    out.push('##XYDATA=(X++(Y..Y))');
    let i = 0;
    while (i < n) {
      let line = num(Number((x[0] + i * dx).toPrecision(12)));
      const start = i;
      while (i < n) {
        const cell = ` ${Math.round(y[i] / JCAMP_YFACTOR)}`;
        if (line.length + cell.length > LINE_MAX && i > start) break;
        line += cell;
        i++;
      }
      out.push(line);
    }
  } else {
    out.push('##XFACTOR= 1', '##YFACTOR= 1');
    out.push(`##FIRSTX= ${num(x[0])}`, `##LASTX= ${num(x[n - 1])}`);
    out.push(`##MAXY= ${num(maxY)}`, `##MINY= ${num(minY)}`, `##NPOINTS= ${n}`, `##FIRSTY= ${num(y[0])}`);
    out.push('##XYPOINTS=(XY..XY)');
    for (let i = 0; i < n; i++) out.push(`${num(x[i])}, ${num(y[i])}`);
  }
  out.push('##END=');
  return out.join('\r\n') + '\r\n';
}
