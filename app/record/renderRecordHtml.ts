/**
 * The commissioning record as one self-contained HTML page: inline CSS, inline SVG plots, no scripts, no links to
 * fetch, so it opens the same way years later on a PC without network. Prints on A4.
 */
import { escapeXml, figureToSvg } from './figure';
import { foldFigure, transferFigure } from './plots';
import { outcomeStatement } from './outcomeStatement';
import { formatReading, linkEventCountText, linkHealthSentence, partMeasurementCells, recordLimitsNote, rowVerdictWords, trimCells, type CommissioningRecord } from './recordModel';
import { outcomeWords } from '../contract/records';

/** The outcome first, in a box a reviewer cannot miss (app/record/outcomeStatement.ts words it). */
function outcomeHtml(record: CommissioningRecord): string {
  const statement = outcomeStatement(record.session);
  const symbol = statement.tone === 'accepted' ? '\u2713' : statement.tone === 'excepted' ? '\u26a0' : '\u2013';
  return `<section class="outcome ${statement.tone}" data-outcome="${record.session.outcome}">
<h2><span aria-hidden="true">${symbol}</span> ${escapeXml(statement.heading)}</h2>
${statement.lines.map((line) => `<p>${escapeXml(line)}</p>`).join('\n')}
${statement.reason === null ? '' : `<p>Reason written at sign-off:</p><blockquote>${escapeXml(statement.reason)}</blockquote>`}
${statement.exceptions.length === 0 ? '' : `<p>Exceptions:</p><ul>${statement.exceptions.map((line) => `<li>${escapeXml(line)}</li>`).join('')}</ul>`}
</section>`;
}

const style = `
body { font-family: Helvetica, Arial, sans-serif; color: #23262a; margin: 24px auto; max-width: 760px; line-height: 1.35; }
h1 { font-size: 22px; margin: 0 0 4px; } h2 { font-size: 16px; margin: 22px 0 6px; border-bottom: 1px solid #c9ccd1; padding-bottom: 2px; }
table { border-collapse: collapse; width: 100%; font-size: 13px; } th, td { text-align: left; padding: 3px 6px; border-bottom: 1px solid #e2e4e7; vertical-align: top; }
th { background: #f1f2f4; } td.number { text-align: right; font-variant-numeric: tabular-nums; }
.verdict { font-weight: bold; white-space: nowrap; } .in-tolerance { color: #2f7d5b; } .marginal { color: #9a5b00; } .out-of-tolerance { color: #b02a2a; } .not-measured { color: #555; }
.outcome { border: 2px solid #5b6b82; border-left-width: 8px; padding: 8px 12px; margin: 12px 0; } .outcome h2 { border: none; margin: 0 0 4px; font-size: 18px; }
.outcome.accepted { border-color: #2f7d5b; } .outcome.excepted { border-color: #b02a2a; background: #fbf1f0; } .outcome.not-certified { border-color: #8a8f96; background: #f4f4f2; }
.outcome blockquote { margin: 6px 0; padding: 4px 10px; border-left: 3px solid #b02a2a; background: #fff; font-style: italic; }
.identity td:first-child { width: 30%; color: #555; } .hash { font-family: monospace; font-size: 11px; word-break: break-all; }
.note { font-size: 12px; color: #444; background: #f6f6f4; border-left: 3px solid #5b6b82; padding: 6px 10px; }
svg { max-width: 100%; height: auto; } figure { margin: 8px 0; } figcaption { font-size: 12px; color: #555; }
@media print { body { margin: 0; } h2 { break-after: avoid; } figure, table { break-inside: avoid; } }`;

const cell = (text: string, className = '') => `<td${className ? ` class="${className}"` : ''}>${escapeXml(text)}</td>`;
const when = (iso: string | null) => (iso === null ? '-' : iso.replace('T', ' ').replace(/\.\d+Z$/, ' UTC').replace(/Z$/, ' UTC'));

export function renderRecordHtml(record: CommissioningRecord): string {
  const identity: Array<[string, string, string?]> = [
    ['Unit (serial number)', record.unit.serial],
    ['Board design', `${record.design.name}, version ${record.design.version}`],
    ['Design content hash (sha-256)', record.design.contentHash, 'hash'],
    ['Session', `${record.session.id} (${outcomeWords[record.session.outcome].phrase})`],
    ['Operator', record.session.operator],
    ['Started', when(record.session.startedAt)],
    ['Ended', when(record.session.endedAt)],
    ['Cycles measured', String(record.session.cycles)],
    ['Record made', when(record.generatedAt)],
  ];
  const recorded = record.readings.source === 'recorded';
  const readingRows = record.readings.rows.map((row) => {
    const words = rowVerdictWords(row);
    return `<tr>${recorded ? cell(row.step ?? '') : ''}${cell(row.label)}${cell(row.measured, 'number')}${cell(row.design, 'number')}${cell(row.band)}<td class="verdict ${row.verdict ?? 'information'}"><span aria-hidden="true">${words.symbol}</span> ${escapeXml(words.text)}</td>${cell(row.note)}</tr>`;
  });
  const trimRows = record.trims.map((trim) => `<tr>${trimCells(trim).map((text, index) => cell(text, index > 0 ? 'number' : '')).join('')}${cell(trim.method)}${cell(trim.reason)}${cell(when(trim.at))}</tr>`);
  const measurementRows = record.partMeasurements.map((measurement) => `<tr>${partMeasurementCells(measurement).map((text, index) => cell(text, index > 0 ? 'number' : '')).join('')}${cell(when(measurement.at))}</tr>`);
  const eventRows = record.link.events.map((event) => `<tr>${cell(event.kind)}${cell(event.detail)}${cell(linkEventCountText(event), 'number')}${cell(when(event.at))}</tr>`);
  const captureRows = record.captures.map((capture) => `<tr>${cell(capture.label ?? '-')}${cell(when(capture.startedAt))}${cell(`${capture.seconds.toFixed(3)} s at ${formatReading(capture.sampleRateHz, 'Hz')}`)}${cell(capture.roles.join(', '))}<td class="hash">${capture.sha256}</td></tr>`);
  const fit = record.transfer.fit;
  const fitText = fit
    ? `Least-squares line: alpha = ${fit.offsetDeg.toFixed(2)} deg + ${fit.gainDegPerV.toFixed(3)} deg/V x control, over ${fit.controlMinV.toFixed(2)} to ${fit.controlMaxV.toFixed(2)} V, ${record.transfer.points.length} points${record.transfer.maxDeviationDeg === null ? '' : `, largest deviation ${record.transfer.maxDeviationDeg.toFixed(2)} deg`}.`
    : 'No transfer curve was recorded in this session.';
  const table = (head: string[], rows: string[], empty: string) =>
    rows.length === 0 ? `<p>${escapeXml(empty)}</p>` : `<table><thead><tr>${head.map((title) => `<th>${escapeXml(title)}</th>`).join('')}</tr></thead><tbody>${rows.join('\n')}</tbody></table>`;
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta name="rampwright-captures-sha256" content="${record.capturesSha256 ?? ''}">
<meta name="rampwright-session" content="${record.session.id}">
<title>Commissioning record: ${escapeXml(record.unit.serial)}, session ${record.session.id}</title>
<style>${style}</style></head>
<body>
<h1>Commissioning record</h1>
<p>${escapeXml(record.unit.serial)} &middot; ${escapeXml(record.design.name)} &middot; ${escapeXml(when(record.session.startedAt))}</p>
${outcomeHtml(record)}
<h2>Unit and design</h2>
<table class="identity"><tbody>${identity.map(([name, value, className]) => `<tr>${cell(name)}${cell(value, className ?? '')}</tr>`).join('\n')}</tbody></table>
${record.session.notes ? `<p>Notes: ${escapeXml(record.session.notes)}</p>` : ''}
<h2>${recorded ? 'Readings as recorded at each step' : 'Readings against the design'}</h2>
${table([...(recorded ? ['Step'] : []), 'Reading', 'Measured', 'Design', recorded ? 'Band' : 'Tolerance', 'Verdict', 'Note'], readingRows, 'No readings were stored with this session.')}
<h2>Cycle fold</h2>
${record.fold.length > 0 ? `<figure>${figureToSvg(foldFigure(record.fold))}<figcaption>The last ${record.fold.length} cycles of the stored capture drawn over one mains cycle; dashed lines mark the zero crossings, solid plum lines the firing point.</figcaption></figure>` : '<p>No capture was kept in this session, so there is no fold to draw.</p>'}
<h2>Transfer curve</h2>
${record.transfer.points.length > 0 ? `<figure>${figureToSvg(transferFigure([record.transfer]))}<figcaption>${escapeXml(fitText)}</figcaption></figure>` : `<p>${escapeXml(fitText)}</p>`}
<h2>Parts measured on the board</h2>
${table(['Part', 'Measured', 'Design', 'Off by', 'When'], measurementRows, 'No part values were measured in this session.')}
<h2>Changes made to the board</h2>
${table(['Part', 'From', 'To', 'Method', 'Reason', 'When'], trimRows, 'No part was changed.')}
<h2>Link health</h2>
<p>${escapeXml(linkHealthSentence(record.link))}</p>
${table(['Event', 'Detail', 'Count', 'When'], eventRows, 'No link events were recorded.')}
<h2>Raw captures</h2>
${table(['Label', 'Started', 'Length', 'Signals', 'sha-256 of the samples'], captureRows, 'No capture was kept in this session.')}
<p>Capture digest (sha-256 over the captures' hashes, see below): <span class="hash">${record.capturesSha256 ?? 'none'}</span></p>
<p class="note">Check this record against the logbook: <code>rampwright report --db &lt;logbook&gt; --session ${record.session.id} --verify &lt;this file&gt;</code>. The digest is the sha-256 of the text "rampwright-captures-v1" and each capture's sha-256 (raw samples as little-endian float64, channel after channel), one per line, in order of their start.</p>
<h2>What this record is</h2>
<div class="note">${recordLimitsNote.map((line) => `<p>${escapeXml(line)}</p>`).join('')}</div>
</body></html>
`;
}
