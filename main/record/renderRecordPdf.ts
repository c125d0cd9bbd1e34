/**
 * The commissioning record as a PDF (pdf-lib, A4, Helvetica): the same content as the HTML page
 * (app/record/renderRecordHtml.ts), plots drawn as vectors from the same Figures. The capture digest also goes into
 * the document's keywords so `rampwright report --verify` can read it back without parsing page text.
 */
import { PDFDocument, StandardFonts, type PDFFont, type PDFPage } from 'pdf-lib';
import { foldFigure, transferFigure } from '../../app/record/plots';
import { formatReading, linkEventCountText, linkHealthSentence, partMeasurementCells, recordLimitsNote, rowVerdictWords, trimCells, type CommissioningRecord } from '../../app/record/recordModel';
import { outcomeWords } from '../../app/contract/records';
import { outcomeStatement, type OutcomeStatement } from '../../app/record/outcomeStatement';
import { drawFigure, hexColour } from './pdfFigure';
import { wrapText } from './pdfText';

const pageSize: [number, number] = [595.28, 841.89];
const margin = 40;
const contentWidth = pageSize[0] - 2 * margin;
export const digestKeywordPrefix = 'rampwright-captures-sha256:';

const verdictInk = { 'in-tolerance': '#2f7d5b', marginal: '#9a5b00', 'out-of-tolerance': '#b02a2a', 'not-measured': '#555555' } as const;
const outcomeInk = { accepted: '#2f7d5b', excepted: '#b02a2a', 'not-certified': '#8a8f96' } as const;

class PdfFlow {
  page: PDFPage;
  y: number;
  constructor(private readonly document: PDFDocument, readonly font: PDFFont, readonly bold: PDFFont) {
    this.page = document.addPage(pageSize);
    this.y = pageSize[1] - margin;
  }
  ensure(heightPt: number): void {
    if (this.y - heightPt < margin) {
      this.page = this.document.addPage(pageSize);
      this.y = pageSize[1] - margin;
    }
  }
  text(text: string, options: { size?: number; bold?: boolean; colour?: string; indent?: number; gapAfter?: number } = {}): void {
    const size = options.size ?? 10;
    const font = options.bold ? this.bold : this.font;
    const indent = options.indent ?? 0;
    for (const line of wrapText(text, (candidate) => font.widthOfTextAtSize(candidate, size), contentWidth - indent)) {
      this.ensure(size * 1.35);
      this.page.drawText(line, { x: margin + indent, y: this.y - size, size, font, color: hexColour(options.colour ?? '#23262a') });
      this.y -= size * 1.35;
    }
    this.y -= options.gapAfter ?? 2;
  }
  heading(text: string): void {
    this.ensure(40);
    this.y -= 8;
    this.text(text, { size: 13, bold: true, gapAfter: 0 });
    this.page.drawLine({ start: { x: margin, y: this.y }, end: { x: margin + contentWidth, y: this.y }, thickness: 0.6, color: hexColour('#c9ccd1') });
    this.y -= 6;
  }
  /** A table with fixed column widths (fractions of the content width); long cells wrap onto more lines. */
  table(head: string[], rows: Array<Array<{ text: string; colour?: string; bold?: boolean; icon?: keyof typeof verdictInk | null }>>, widths: number[]): void {
    const size = 8.5;
    const lineHeight = 10.5;
    const draw = (cells: Array<{ text: string; colour?: string; bold?: boolean; icon?: keyof typeof verdictInk | null }>, header: boolean) => {
      const laid = cells.map((cell, index) => {
        const font = header || cell.bold ? this.bold : this.font;
        const indent = cell.icon ? 11 : 0;
        const width = widths[index] * contentWidth - indent - 4;
        return { cell, font, indent, lines: wrapText(cell.text, (candidate) => font.widthOfTextAtSize(candidate, size), width) };
      });
      const rowHeight = Math.max(1, ...laid.map((entry) => entry.lines.length)) * lineHeight + 3;
      this.ensure(rowHeight);
      let x = margin;
      laid.forEach(({ cell, font, indent, lines }, index) => {
        if (cell.icon) drawVerdictIcon(this.page, cell.icon, x + 6, this.y - lineHeight / 2 - 2);
        lines.forEach((line, lineIndex) => {
          this.page.drawText(line, { x: x + 2 + indent, y: this.y - (lineIndex + 1) * lineHeight + 1, size, font, color: hexColour(cell.colour ?? '#23262a') });
        });
        x += widths[index] * contentWidth;
      });
      this.y -= rowHeight;
      this.page.drawLine({ start: { x: margin, y: this.y }, end: { x: margin + contentWidth, y: this.y }, thickness: header ? 0.8 : 0.3, color: hexColour(header ? '#8a8f96' : '#e2e4e7') });
    };
    draw(head.map((text) => ({ text })), true);
    for (const row of rows) draw(row, false);
    this.y -= 4;
  }
  /** The outcome in a framed box with a thick left bar in the tone's ink (one page: the box is never split). */
  outcomeBox(statement: OutcomeStatement): void {
    const ink = outcomeInk[statement.tone];
    const width = contentWidth - 24;
    const blocks: Array<{ text: string; size: number; bold: boolean; indent: number }> = [
      { text: statement.heading, size: 14, bold: true, indent: 0 },
      ...statement.lines.map((text) => ({ text, size: 9.5, bold: false, indent: 0 })),
      ...(statement.reason === null ? [] : [{ text: 'Reason written at sign-off:', size: 9.5, bold: true, indent: 0 }, { text: `"${statement.reason}"`, size: 10, bold: false, indent: 10 }]),
      ...(statement.exceptions.length === 0 ? [] : [{ text: 'Exceptions:', size: 9.5, bold: true, indent: 0 }, ...statement.exceptions.map((text) => ({ text: `- ${text}`, size: 9.5, bold: false, indent: 10 }))]),
    ];
    const laid = blocks.map((block) => ({ ...block, lines: wrapText(block.text, (candidate) => (block.bold ? this.bold : this.font).widthOfTextAtSize(candidate, block.size), width - block.indent) }));
    const height = laid.reduce((sum, block) => sum + block.lines.length * block.size * 1.35, 0) + 16;
    this.ensure(height + 8);
    const top = this.y - 4;
    this.page.drawRectangle({ x: margin, y: top - height, width: contentWidth, height, borderColor: hexColour(ink), borderWidth: 1.6, color: hexColour(statement.tone === 'excepted' ? '#fbf1f0' : '#ffffff') });
    this.page.drawRectangle({ x: margin, y: top - height, width: 7, height, color: hexColour(ink) });
    let y = top - 8;
    for (const block of laid) {
      for (const line of block.lines) {
        this.page.drawText(line, { x: margin + 16 + block.indent, y: y - block.size, size: block.size, font: block.bold ? this.bold : this.font, color: hexColour(block.bold && block.size > 10 ? ink : '#23262a') });
        y -= block.size * 1.35;
      }
    }
    this.y = top - height - 8;
  }
  figure(figure: Parameters<typeof drawFigure>[1]): void {
    const height = (figure.heightPx * contentWidth) / figure.widthPx;
    this.ensure(height + 4);
    this.y -= drawFigure(this.page, figure, { left: margin, top: this.y, widthPt: contentWidth, font: this.font }) + 4;
  }
}

/**
 * A shape per verdict, so the PDF never relies on colour alone: disc (in tolerance), triangle (marginal), square
 * with a cross (out), a short dash for "not measured yet" (no tick, no cross).
 */
function drawVerdictIcon(page: PDFPage, verdict: keyof typeof verdictInk, centreX: number, centreY: number): void {
  const colour = hexColour(verdictInk[verdict]);
  if (verdict === 'in-tolerance') page.drawCircle({ x: centreX, y: centreY, size: 3.2, color: colour });
  else if (verdict === 'marginal') page.drawSvgPath('M0 -3.8 L4 3.2 L-4 3.2 Z', { x: centreX, y: centreY, color: colour });
  else if (verdict === 'not-measured') page.drawLine({ start: { x: centreX - 3.3, y: centreY }, end: { x: centreX + 3.3, y: centreY }, thickness: 1.2, color: colour });
  else {
    page.drawRectangle({ x: centreX - 3.3, y: centreY - 3.3, width: 6.6, height: 6.6, borderColor: colour, borderWidth: 1 });
    page.drawLine({ start: { x: centreX - 2.4, y: centreY - 2.4 }, end: { x: centreX + 2.4, y: centreY + 2.4 }, thickness: 1, color: colour });
    page.drawLine({ start: { x: centreX - 2.4, y: centreY + 2.4 }, end: { x: centreX + 2.4, y: centreY - 2.4 }, thickness: 1, color: colour });
  }
}

const when = (iso: string | null) => (iso === null ? '-' : iso.replace('T', ' ').replace(/\.\d+Z$/, ' UTC').replace(/Z$/, ' UTC'));

export async function renderRecordPdf(record: CommissioningRecord): Promise<Uint8Array> {
  const document = await PDFDocument.create();
  const created = new Date(record.generatedAt);
  document.setTitle(`Commissioning record: ${record.unit.serial}, session ${record.session.id}`);
  document.setSubject(`Board design ${record.design.name} version ${record.design.version}`);
  document.setKeywords([`${digestKeywordPrefix}${record.capturesSha256 ?? 'none'}`, `rampwright-session:${record.session.id}`]);
  document.setProducer('Rampwright');
  document.setCreator('Rampwright');
  document.setCreationDate(created);
  document.setModificationDate(created);
  const flow = new PdfFlow(document, await document.embedFont(StandardFonts.Helvetica), await document.embedFont(StandardFonts.HelveticaBold));

  flow.text('Commissioning record', { size: 20, bold: true });
  flow.text(`${record.unit.serial} - ${record.design.name} - ${when(record.session.startedAt)}`, { size: 10, colour: '#555555', gapAfter: 6 });
  flow.outcomeBox(outcomeStatement(record.session));
  flow.heading('Unit and design');
  const identity: Array<[string, string]> = [
    ['Unit (serial number)', record.unit.serial],
    ['Board design', `${record.design.name}, version ${record.design.version}`],
    ['Design content hash', record.design.contentHash],
    ['Session', `${record.session.id} (${outcomeWords[record.session.outcome].phrase})`],
    ['Operator', record.session.operator],
    ['Started / ended', `${when(record.session.startedAt)} / ${when(record.session.endedAt)}`],
    ['Cycles measured', String(record.session.cycles)],
    ['Record made', when(record.generatedAt)],
  ];
  flow.table(['Item', 'Value'], identity.map(([name, value]) => [{ text: name }, { text: value }]), [0.28, 0.72]);
  if (record.session.notes) flow.text(`Notes: ${record.session.notes}`);

  const recorded = record.readings.source === 'recorded';
  flow.heading(recorded ? 'Readings as recorded at each step' : 'Readings against the design');
  if (record.readings.rows.length === 0) flow.text('No readings were stored with this session.');
  else {
    flow.table(
      [...(recorded ? ['Step'] : []), 'Reading', 'Measured', 'Design', recorded ? 'Band' : 'Tolerance', 'Verdict', 'Note'],
      record.readings.rows.map((row) => {
        const words = rowVerdictWords(row);
        return [
          ...(recorded ? [{ text: row.step ?? '' }] : []),
          { text: row.label },
          { text: row.measured },
          { text: row.design },
          { text: row.band },
          { text: words.text, bold: true, colour: row.verdict ? verdictInk[row.verdict] : '#555555', icon: row.verdict },
          { text: row.note },
        ];
      }),
      recorded ? [0.12, 0.21, 0.1, 0.1, 0.13, 0.16, 0.18] : [0.3, 0.12, 0.12, 0.16, 0.17, 0.13],
    );
  }

  flow.heading('Cycle fold');
  if (record.fold.length > 0) {
    flow.figure(foldFigure(record.fold));
    flow.text(`The last ${record.fold.length} cycles of the stored capture drawn over one mains cycle; dashed lines mark the zero crossings, solid plum lines the firing point.`, { size: 8.5, colour: '#555555' });
  } else flow.text('No capture was kept in this session, so there is no fold to draw.');

  flow.heading('Transfer curve');
  const fit = record.transfer.fit;
  if (record.transfer.points.length > 0) flow.figure(transferFigure([record.transfer]));
  flow.text(
    fit
      ? `Least-squares line: alpha = ${fit.offsetDeg.toFixed(2)} deg + ${fit.gainDegPerV.toFixed(3)} deg/V x control, over ${fit.controlMinV.toFixed(2)} to ${fit.controlMaxV.toFixed(2)} V, ${record.transfer.points.length} points${record.transfer.maxDeviationDeg === null ? '' : `, largest deviation ${record.transfer.maxDeviationDeg.toFixed(2)} deg`}.`
      : 'No transfer curve was recorded in this session.',
    { size: 9 },
  );

  flow.heading('Parts measured on the board');
  if (record.partMeasurements.length === 0) flow.text('No part values were measured in this session.');
  else flow.table(['Part', 'Measured', 'Design', 'Off by', 'When'], record.partMeasurements.map((measurement) => [...partMeasurementCells(measurement).map((text) => ({ text })), { text: when(measurement.at) }]), [0.16, 0.18, 0.18, 0.14, 0.34]);

  flow.heading('Changes made to the board');
  if (record.trims.length === 0) flow.text('No part was changed.');
  else flow.table(['Part', 'From', 'To', 'Method', 'Reason', 'When'], record.trims.map((trim) => [...trimCells(trim).map((text) => ({ text })), { text: trim.method }, { text: trim.reason }, { text: when(trim.at) }]), [0.1, 0.12, 0.12, 0.12, 0.32, 0.22]);

  flow.heading('Link health');
  flow.text(linkHealthSentence(record.link));
  if (record.link.events.length > 0) flow.table(['Event', 'Detail', 'Count', 'When'], record.link.events.map((event) => [{ text: event.kind }, { text: event.detail }, { text: linkEventCountText(event) }, { text: when(event.at) }]), [0.18, 0.48, 0.1, 0.24]);

  flow.heading('Raw captures');
  if (record.captures.length === 0) flow.text('No capture was kept in this session.');
  for (const capture of record.captures) flow.text(`${capture.label ?? 'capture'}: ${when(capture.startedAt)}, ${capture.seconds.toFixed(3)} s at ${formatReading(capture.sampleRateHz, 'Hz')}, ${capture.roles.join(', ')}; sha-256 ${capture.sha256}`, { size: 8.5 });
  flow.text(`Capture digest: ${record.capturesSha256 ?? 'none'}`, { size: 9, bold: true });
  flow.text(`Check against the logbook: rampwright report --db <logbook> --session ${record.session.id} --verify <this file>. The digest is the sha-256 of the text "rampwright-captures-v1" and each capture's sha-256 (raw samples as little-endian float64, channel after channel), one per line, in order of their start.`, { size: 8.5, colour: '#444444' });

  flow.heading('What this record is');
  for (const line of recordLimitsNote) flow.text(line, { size: 9 });
  return document.save({ useObjectStreams: false });
}
