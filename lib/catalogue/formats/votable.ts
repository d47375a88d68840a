/**
 * One curve as an IVOA VOTable 1.4 document (IVOA Recommendation "VOTable
 * Format Definition Version 1.4", 2019), which astropy and TOPCAT open:
 *
 *   VOTABLE(version="1.4", namespace …/VOTable/v1.3 — 1.4 keeps the 1.3 namespace)
 *     RESOURCE(type="results")
 *       DESCRIPTION, INFO (citation, licence), PARAM* (provenance, method, derived numbers), LINK (the permanent page)
 *       TABLE: FIELD wavelength (double, unit "nm", ucd em.wl), FIELD transmission (double, dimensionless, ucd phys.transmission)
 *              DATA/TABLEDATA, one TR per sample
 *
 * Units are VOUnits strings; a dimensionless quantity has the empty unit string
 * (VOUnits 1.0, from memory; astropy reads it as dimensionless). The measuring
 * method travels as PARAMs so a reader needs no knowledge of our JSON.
 */

import { LICENCE_URLS, issuedDate, numOf, textOf, type CurveRecord } from './record';

export const VOTABLE_NAMESPACE = 'http://www.ivoa.net/xml/VOTable/v1.3';

/** XML text or attribute value: the five specials escaped, characters XML 1.0 forbids dropped. */
export function xmlText(s: string): string {
  let out = '';
  for (const ch of s) {
    const c = ch.codePointAt(0)!;
    if (c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d) continue;
    if ((c >= 0xd800 && c <= 0xdfff) || c === 0xfffe || c === 0xffff) continue;
    if (ch === '&') out += '&amp;';
    else if (ch === '<') out += '&lt;';
    else if (ch === '>') out += '&gt;';
    else if (ch === '"') out += '&quot;';
    else if (ch === "'") out += '&apos;';
    else if (c === 0x0a || c === 0x0d || c === 0x09) out += `&#${c};`;
    else out += ch;
  }
  return out;
}

type Param =
  | { name: string; kind: 'text'; value: string; ucd?: string; description: string }
  | { name: string; kind: 'number'; value: number; unit?: string; ucd?: string; description: string };

function paramXml(p: Param, indent: string): string {
  const ucd = p.ucd ? ` ucd="${p.ucd}"` : '';
  const desc = `<DESCRIPTION>${xmlText(p.description)}</DESCRIPTION>`;
  if (p.kind === 'text') {
    return `${indent}<PARAM name="${p.name}" datatype="char" arraysize="*"${ucd} value="${xmlText(p.value)}">${desc}</PARAM>`;
  }
  const unit = p.unit !== undefined ? ` unit="${p.unit}"` : '';
  return `${indent}<PARAM name="${p.name}" datatype="double"${unit}${ucd} value="${String(p.value)}">${desc}</PARAM>`;
}

/** The measuring method as PARAMs, every one with its unit; absent fields are left out, not invented. */
export function methodParams(r: CurveRecord): Param[] {
  const m = r.method;
  const out: Param[] = [{ name: 'instrument', kind: 'text', value: r.instrument, ucd: 'meta.id;instr', description: 'Kind of instrument the curve was measured with' }];
  const res = numOf(m.resolutionNm);
  if (res !== undefined) out.push({ name: 'resolution', kind: 'number', value: res, unit: 'nm', ucd: 'instr.param', description: 'Declared spectral bandwidth or resolution of the measurement' });
  const beam = textOf(m.beam);
  if (beam) out.push({ name: 'beam', kind: 'text', value: beam, ucd: 'instr.setup', description: 'Measuring beam: collimated or converging' });
  const fN = numOf(m.beamFNumber);
  if (fN !== undefined) out.push({ name: 'beam_f_number', kind: 'number', value: fN, unit: '', ucd: 'instr.param', description: 'f-number of a converging measuring beam' });
  out.push({ name: 'aoi', kind: 'number', value: r.aoiDeg, unit: 'deg', ucd: 'instr.param', description: 'Angle of incidence of the measuring beam on the filter' });
  const t = numOf(m.temperatureC);
  if (t !== undefined) out.push({ name: 'temperature', kind: 'number', value: Number((t + 273.15).toFixed(4)), unit: 'K', ucd: 'phys.temperature', description: `Filter temperature during the measurement (${t} degrees Celsius)` });
  const pol = textOf(m.polarization);
  if (pol) out.push({ name: 'polarization', kind: 'text', value: pol, ucd: 'instr.setup', description: 'Polarisation of the measuring light' });
  return out;
}

export function toVotable(r: CurveRecord): string {
  const { wavelengthNm: x, transmission: y } = r.points;
  const date = issuedDate(r);
  const citation = `${r.contributor ?? 'Anonymous contributor'} (${date.slice(0, 4)}). ${r.label}${r.serial ? `, unit ${r.serial}` : ''}: measured transmission curve, revision ${r.revision}. Bandcone curve ${r.id}, ${r.licence}. ${r.url}`;
  const provenance: Param[] = [
    { name: 'curve_id', kind: 'number', value: r.id, ucd: 'meta.id', description: 'Bandcone curve id (each revision has its own)' },
    { name: 'revision', kind: 'number', value: r.revision, ucd: 'meta.version', description: 'Revision number of this curve' },
    { name: 'status', kind: 'text', value: r.status, ucd: 'meta.code.status', description: 'Review status (verified, pending, superseded ...)' },
    { name: 'label', kind: 'text', value: r.label, ucd: 'meta.id', description: 'Filter label as written on it' },
    ...(r.maker ? [{ name: 'maker', kind: 'text' as const, value: r.maker, ucd: 'meta.note', description: 'Maker of the filter' }] : []),
    ...(r.serial ? [{ name: 'serial', kind: 'text' as const, value: r.serial, ucd: 'meta.id', description: 'Serial number of the measured unit' }] : []),
    { name: 'contributor', kind: 'text', value: r.contributor ?? 'Anonymous contributor', ucd: 'meta.note', description: 'Who measured and contributed the curve' },
    ...(r.lab ? [{ name: 'lab', kind: 'text' as const, value: r.lab, ucd: 'meta.note', description: 'Where the curve was measured' }] : []),
    ...(r.measuredOn ? [{ name: 'measured_on', kind: 'text' as const, value: r.measuredOn, ucd: 'time.epoch;obs', description: 'Date of the measurement (ISO 8601)' }] : []),
    ...(r.verifiedAt ? [{ name: 'verified_on', kind: 'text' as const, value: r.verifiedAt.slice(0, 10), ucd: 'time.epoch', description: 'Date a moderator verified this revision (ISO 8601)' }] : []),
    { name: 'licence', kind: 'text', value: r.licence, ucd: 'meta.note', description: 'Licence of the data' },
    { name: 'url', kind: 'text', value: r.url, ucd: 'meta.ref.url', description: 'Permanent page of this revision' },
  ];
  const derived: Param[] = [
    { name: 'peak_transmission', kind: 'number', value: r.derived.peakT, unit: '', ucd: 'phys.transmission;stat.max', description: 'Peak transmission (fraction)' },
    ...(r.derived.cwlNm !== null ? [{ name: 'cwl', kind: 'number' as const, value: r.derived.cwlNm, unit: 'nm', ucd: 'em.wl.central', description: 'Centre wavelength: midpoint of the half-maximum crossings' }] : []),
    ...(r.derived.fwhmNm !== null ? [{ name: 'fwhm', kind: 'number' as const, value: r.derived.fwhmNm, unit: 'nm', ucd: 'instr.bandwidth', description: 'Full width at half maximum' }] : []),
    ...(r.derived.nEff !== null ? [{ name: 'n_eff', kind: 'number' as const, value: r.derived.nEff, unit: '', ucd: 'phys.refractIndex', description: 'Effective index fitted from the same unit measured at several angles' }] : []),
  ];
  const lines = r.lines.map((l) => `${l.name} ${l.wavelengthNm} nm`).join(', ');
  const out: string[] = [];
  out.push('<?xml version="1.0" encoding="UTF-8"?>');
  out.push(`<VOTABLE version="1.4" xmlns="${VOTABLE_NAMESPACE}" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" xsi:schemaLocation="${VOTABLE_NAMESPACE} http://www.ivoa.net/xml/VOTable/VOTable-1.4.xsd">`);
  out.push(`  <DESCRIPTION>${xmlText(`Measured transmission curve of the interference filter ${r.label} (target lines: ${lines || 'none given'}), Bandcone curve ${r.id} revision ${r.revision}.`)}</DESCRIPTION>`);
  out.push(`  <RESOURCE type="results" name="bandcone_curve_${r.id}">`);
  out.push(`    <INFO name="citation" value="${xmlText(citation)}"/>`);
  out.push(`    <INFO name="licence" value="${xmlText(r.licence)}">${xmlText(LICENCE_URLS[r.licence] ?? r.licence)}</INFO>`);
  for (const p of [...provenance, ...methodParams(r), ...derived]) out.push(paramXml(p, '    '));
  out.push(`    <LINK content-role="doc" title="Curve page" href="${xmlText(r.url)}"/>`);
  out.push(`    <TABLE name="transmission" nrows="${x.length}">`);
  out.push('      <DESCRIPTION>Transmission against wavelength, as measured (at the AOI given by the aoi PARAM).</DESCRIPTION>');
  out.push('      <FIELD name="wavelength" ID="wavelength" datatype="double" unit="nm" ucd="em.wl"><DESCRIPTION>Wavelength in standard air</DESCRIPTION></FIELD>');
  out.push('      <FIELD name="transmission" ID="transmission" datatype="double" unit="" ucd="phys.transmission"><DESCRIPTION>Transmission, a dimensionless fraction 0-1</DESCRIPTION></FIELD>');
  out.push('      <DATA><TABLEDATA>');
  for (let i = 0; i < x.length; i++) out.push(`<TR><TD>${String(x[i])}</TD><TD>${String(y[i])}</TD></TR>`);
  out.push('      </TABLEDATA></DATA>');
  out.push('    </TABLE>');
  out.push('  </RESOURCE>');
  out.push('</VOTABLE>');
  return out.join('\n') + '\n';
}
