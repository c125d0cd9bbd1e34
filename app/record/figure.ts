/**
 * A plot as a list of drawing primitives in a box of `widthPx` x `heightPx` (SVG coordinates: origin top left,
 * y down). One geometry, two renderers: `figureToSvg` here for the HTML record, and the PDF writer in main/record
 * draws the same paths with pdf-lib, so the two records can never show different plots.
 */
export interface FigurePath {
  kind: 'path';
  /** SVG path data (M, L, Z only), in the figure's pixels. */
  d: string;
  stroke: string | null;
  fill: string | null;
  widthPx: number;
  dash?: readonly number[];
  opacity?: number;
}

export interface FigureText {
  kind: 'text';
  x: number;
  y: number;
  text: string;
  sizePx: number;
  colour: string;
  anchor: 'start' | 'middle' | 'end';
}

export type FigureItem = FigurePath | FigureText;

export interface Figure {
  widthPx: number;
  heightPx: number;
  /** Short description for screen readers (the SVG's <title>) and the PDF caption. */
  title: string;
  items: FigureItem[];
}

/** Text safe inside XML/HTML element content and attribute values. */
export function escapeXml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/** Coordinates with two decimals: enough for print, short enough for a readable file. */
export function px(value: number): string {
  return (Math.round(value * 100) / 100).toString();
}

export function pathFromPoints(points: ReadonlyArray<readonly [number, number]>, close = false): string {
  if (points.length === 0) return '';
  const parts = points.map(([x, y], index) => `${index === 0 ? 'M' : 'L'}${px(x)} ${px(y)}`);
  return close ? `${parts.join(' ')} Z` : parts.join(' ');
}

export function figureToSvg(figure: Figure): string {
  const body = figure.items.map((item) => {
    if (item.kind === 'text') {
      return `<text x="${px(item.x)}" y="${px(item.y)}" font-size="${px(item.sizePx)}" fill="${item.colour}" text-anchor="${item.anchor}">${escapeXml(item.text)}</text>`;
    }
    const attributes = [
      `d="${item.d}"`,
      `fill="${item.fill ?? 'none'}"`,
      `stroke="${item.stroke ?? 'none'}"`,
      `stroke-width="${px(item.widthPx)}"`,
      item.dash && item.dash.length > 0 ? `stroke-dasharray="${item.dash.join(' ')}"` : '',
      item.opacity !== undefined && item.opacity < 1 ? `opacity="${px(item.opacity)}"` : '',
    ].filter((attribute) => attribute !== '');
    return `<path ${attributes.join(' ')}/>`;
  });
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" role="img" viewBox="0 0 ${px(figure.widthPx)} ${px(figure.heightPx)}" width="${px(figure.widthPx)}" height="${px(figure.heightPx)}" font-family="Helvetica, Arial, sans-serif">`,
    `<title>${escapeXml(figure.title)}</title>`,
    ...body,
    '</svg>',
  ].join('\n');
}
