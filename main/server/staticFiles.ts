/**
 * Serves the built screens (dist/renderer) from disk: no network, no directory listing, nothing outside the folder,
 * and no source maps unless asked for (development): a map hands out the screens' source to anyone who asks.
 */
import { readFile, stat } from 'node:fs/promises';
import { extname, join, normalize, resolve, sep } from 'node:path';

const mediaTypes: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.txt': 'text/plain; charset=utf-8',
};

export interface StaticFile {
  body: Buffer;
  mediaType: string;
}

/** Resolves a URL path inside `root`; null for anything that would leave it, is not a file, or is a map not asked for. */
export async function readStaticFile(root: string, urlPath: string, options: { sourceMaps?: boolean } = {}): Promise<StaticFile | null> {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath.split('?')[0]);
  } catch {
    return null;
  }
  if (decoded.includes('\0')) return null;
  const relative = decoded === '/' || decoded === '' ? 'index.html' : normalize(decoded).replace(/^([/\\])+/, '');
  const absoluteRoot = resolve(root);
  const absolute = resolve(join(absoluteRoot, relative));
  if (absolute !== absoluteRoot && !absolute.startsWith(absoluteRoot + sep)) return null;
  if (!options.sourceMaps && extname(absolute).toLowerCase() === '.map') return null;
  try {
    const info = await stat(absolute);
    if (!info.isFile()) return null;
    return { body: await readFile(absolute), mediaType: mediaTypes[extname(absolute).toLowerCase()] ?? 'application/octet-stream' };
  } catch {
    return null;
  }
}

/** The content security policy of the screens in browser mode: our own scripts only, events over our own socket. */
export const rendererContentSecurityPolicy =
  "default-src 'self'; script-src 'self'; style-src 'self' 'unsafe-inline'; img-src 'self' data: blob:; font-src 'self'; connect-src 'self'; object-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";
