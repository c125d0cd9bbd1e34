/**
 * Recall pages (two sessions side by side, a unit's drift, a design's fleet) as self-contained HTML, from plain
 * sections: a heading, sentences, a table and ready-made SVG plots. Same look as the commissioning record.
 */
import { escapeXml } from './figure';

export interface RecallSection {
  heading: string;
  paragraphs?: string[];
  /** Sentences to stand out (warnings), marked with a symbol and the word "Warning", never colour alone. */
  warnings?: string[];
  table?: { head: string[]; rows: string[][]; flaggedRows?: number[] };
  svgs?: string[];
}

const style = `
body { font-family: Helvetica, Arial, sans-serif; color: #23262a; margin: 24px auto; max-width: 860px; line-height: 1.35; }
h1 { font-size: 22px; margin: 0 0 4px; } h2 { font-size: 16px; margin: 22px 0 6px; border-bottom: 1px solid #c9ccd1; padding-bottom: 2px; }
table { border-collapse: collapse; width: 100%; font-size: 13px; } th, td { text-align: left; padding: 3px 6px; border-bottom: 1px solid #e2e4e7; }
th { background: #f1f2f4; } tr.flagged td { font-weight: bold; background: #fbf1e9; }
.warning { border-left: 3px solid #b02a2a; background: #fbf0f0; padding: 6px 10px; margin: 6px 0; }
.plots { display: flex; flex-wrap: wrap; gap: 8px; } svg { max-width: 100%; height: auto; }`;

export function renderRecallHtml(title: string, sections: readonly RecallSection[], options: { generatedAt: string }): string {
  const body = sections.map((section) => {
    const parts = [`<h2>${escapeXml(section.heading)}</h2>`];
    for (const warning of section.warnings ?? []) parts.push(`<p class="warning"><span aria-hidden="true">\u26a0</span> <strong>Warning:</strong> ${escapeXml(warning)}</p>`);
    for (const paragraph of section.paragraphs ?? []) parts.push(`<p>${escapeXml(paragraph)}</p>`);
    if (section.table) {
      const flagged = new Set(section.table.flaggedRows ?? []);
      parts.push(
        `<table><thead><tr>${section.table.head.map((cell) => `<th>${escapeXml(cell)}</th>`).join('')}</tr></thead><tbody>${section.table.rows
          .map((row, index) => `<tr${flagged.has(index) ? ' class="flagged"' : ''}>${row.map((cell) => `<td>${escapeXml(cell)}</td>`).join('')}</tr>`)
          .join('\n')}</tbody></table>`,
      );
    }
    if (section.svgs && section.svgs.length > 0) parts.push(`<div class="plots">${section.svgs.join('\n')}</div>`);
    return parts.join('\n');
  });
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>${escapeXml(title)}</title><style>${style}</style></head>
<body><h1>${escapeXml(title)}</h1><p>Made ${escapeXml(options.generatedAt.replace('T', ' ').replace(/\.\d+Z$/, ' UTC'))} from the logbook.</p>
${body.join('\n')}
</body></html>
`;
}
