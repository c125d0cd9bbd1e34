/**
 * Text for the PDF's standard fonts, which encode WinAnsi (Windows-1252) only: the few symbols the record uses are
 * spelled out, anything else outside that set becomes "?" rather than failing the whole record.
 */
const replacements: Record<string, string> = { '\u2713': 'OK', '\u26a0': '!', '\u2717': 'X', '\u2013': '-', '\u2014': '-', '\u2212': '-', '\u00b7': '\u00b7' };

export function winAnsiText(text: string): string {
  let out = '';
  for (const character of text) {
    const replacement = replacements[character];
    if (replacement !== undefined) out += replacement;
    else if (character === '\n' || character === '\t') out += ' ';
    else {
      const code = character.codePointAt(0) ?? 63;
      // Printable ASCII and Latin-1 map straight to WinAnsi; the rest of Windows-1252 is not needed here.
      out += (code >= 32 && code < 127) || (code >= 160 && code <= 255) ? character : '?';
    }
  }
  return out;
}

/** Splits text into lines no wider than `widthPt` at the given font size. */
export function wrapText(text: string, measure: (line: string) => number, widthPt: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of winAnsiText(text).split(' ')) {
    const candidate = line === '' ? word : `${line} ${word}`;
    if (measure(candidate) <= widthPt || line === '') line = candidate;
    else {
      lines.push(line);
      line = word;
    }
  }
  if (line !== '') lines.push(line);
  return lines;
}
