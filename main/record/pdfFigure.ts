/**
 * Draws a record Figure (app/record/figure.ts) on a pdf-lib page as vector paths and text, scaled to a width.
 * pdf-lib's drawSvgPath takes SVG path data with y down from the given origin, so the figure's coordinates go
 * through unchanged; text is placed by hand at the same points.
 */
import { rgb, type PDFFont, type PDFPage, type RGB } from 'pdf-lib';
import type { Figure } from '../../app/record/figure';
import { winAnsiText } from './pdfText';

export function hexColour(hex: string): RGB {
  const value = Number.parseInt(hex.replace('#', ''), 16);
  return rgb(((value >> 16) & 255) / 255, ((value >> 8) & 255) / 255, (value & 255) / 255);
}

/** Draws the figure with its top-left corner at (left, top) in PDF points, `widthPt` wide; returns the height used. */
export function drawFigure(page: PDFPage, figure: Figure, placement: { left: number; top: number; widthPt: number; font: PDFFont }): number {
  const scale = placement.widthPt / figure.widthPx;
  for (const item of figure.items) {
    if (item.kind === 'path') {
      if (item.d === '') continue;
      page.drawSvgPath(item.d, {
        x: placement.left,
        y: placement.top,
        scale,
        ...(item.fill ? { color: hexColour(item.fill), opacity: item.opacity ?? 1 } : {}),
        ...(item.stroke ? { borderColor: hexColour(item.stroke), borderWidth: item.widthPx * scale, borderOpacity: item.opacity ?? 1, borderDashArray: item.dash ? item.dash.map((length) => length * scale) : undefined } : { borderWidth: 0 }),
      });
      continue;
    }
    const text = winAnsiText(item.text);
    const size = item.sizePx * scale;
    const width = placement.font.widthOfTextAtSize(text, size);
    const shift = item.anchor === 'middle' ? width / 2 : item.anchor === 'end' ? width : 0;
    page.drawText(text, { x: placement.left + item.x * scale - shift, y: placement.top - item.y * scale, size, font: placement.font, color: hexColour(item.colour) });
  }
  return figure.heightPx * scale;
}
