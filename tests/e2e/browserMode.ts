/**
 * Browser mode for the end-to-end suite: the built command line serving the built screens with the virtual board
 * (`serve --demo --port 0`) on a fresh logbook in a temp folder, and Debian's Chromium driven by playwright-core.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

export const repoRoot = resolve(__dirname, '..', '..');
export const screensFolder = join(repoRoot, 'test-output', 'screens');

export interface DemoServer {
  /** The address the server printed, carrying this run's access token: open this one. */
  url: string;
  /** `http://127.0.0.1:<port>`, for building other addresses (which need `token` too). */
  origin: string;
  /** This run's access token. */
  token: string;
  /** The server's own temporary folder (the logbook, the data folder); removed by `stop`. */
  folder: string;
  logbookPath: string;
  output(): string;
  stop(): Promise<void>;
}

/**
 * Starts `node dist/rampwright.js serve --demo --port 0 --db <fresh file>` and waits for the address it prints,
 * which carries the run's access token (the server refuses every request without it). `db` serves another logbook
 * (a file or a shared logbook's address) and `args` adds options; `demo: false` leaves the virtual board out.
 */
export async function startDemoServer(options: { speed?: number; db?: string; demo?: boolean; args?: string[] } = {}): Promise<DemoServer> {
  const cli = join(repoRoot, 'dist', 'rampwright.js');
  if (!existsSync(cli) || !existsSync(join(repoRoot, 'dist', 'renderer', 'index.js'))) throw new Error('build first: npm run build (dist/rampwright.js and dist/renderer are missing)');
  const folder = mkdtempSync(join(tmpdir(), 'rampwright-e2e-'));
  const logbookPath = options.db ?? join(folder, 'logbook.sqlite');
  const demo = (options.demo ?? true) ? ['--demo'] : [];
  const child: ChildProcess = spawn(process.execPath, [cli, 'serve', ...demo, '--port', '0', '--db', logbookPath, '--speed', String(options.speed ?? 1), ...(options.args ?? [])], { cwd: repoRoot, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, XDG_DATA_HOME: folder, HOME: folder } });
  let output = '';
  child.stdout?.on('data', (chunk: Buffer) => (output += chunk.toString('utf8')));
  child.stderr?.on('data', (chunk: Buffer) => (output += chunk.toString('utf8')));
  const [url, origin, token] = await new Promise<[string, string, string]>((resolveUrl, reject) => {
    const timer = setTimeout(() => reject(new Error(`the server printed no address within 30 s:\n${output}`)), 30_000);
    const look = () => {
      const match = /((http:\/\/127\.0\.0\.1:\d+)\/\?token=([A-Za-z0-9_-]+))\s/.exec(output);
      if (match) {
        clearTimeout(timer);
        resolveUrl([match[1], match[2], match[3]]);
      }
    };
    child.stdout?.on('data', look);
    child.on('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`the server exited with ${code}:\n${output}`));
    });
  });
  return {
    url,
    origin,
    token,
    folder,
    logbookPath,
    output: () => output,
    stop: async () => {
      if (child.exitCode === null) {
        const exited = new Promise<void>((done) => child.once('exit', () => done()));
        child.kill('SIGTERM');
        await Promise.race([exited, new Promise((done) => setTimeout(done, 5000))]);
        if (child.exitCode === null) child.kill('SIGKILL');
      }
      rmSync(folder, { recursive: true, force: true });
    },
  };
}

/** The demo server, Chromium and one page on the screens, ready once the designs are listed; page errors collected. */
export async function openScreens(options: { speed?: number; viewport?: { width: number; height: number } } = {}): Promise<{ server: DemoServer; browser: Browser; page: Page; pageErrors: string[] }> {
  const server = await startDemoServer({ speed: options.speed ?? 1 });
  const browser = await launchChromium();
  const page = await browser.newPage({ viewport: options.viewport ?? { width: 1440, height: 900 }, deviceScaleFactor: 1 });
  const pageErrors = collectPageErrors(page);
  await page.goto(server.url);
  await page.locator('[data-testid="setup-design"] option').first().waitFor({ state: 'attached' });
  return { server, browser, page, pageErrors };
}

export async function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

/** Console errors and uncaught page errors, collected for the final assertion. */
export function collectPageErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error') errors.push(`console: ${message.text()}`);
  });
  page.on('pageerror', (error) => errors.push(`page: ${error.message}`));
  return errors;
}

/**
 * How much of a canvas is drawn on: the share of pixels that differ from its most common colour (the background).
 * Axes alone cover a few percent; traces add more.
 */
export async function canvasInk(page: Page, selector: string): Promise<number> {
  return page.$eval(selector, (element) => {
    const canvas = element as HTMLCanvasElement;
    const context = canvas.getContext('2d');
    if (!context || canvas.width === 0 || canvas.height === 0) return 0;
    const { data } = context.getImageData(0, 0, canvas.width, canvas.height);
    const counts = new Map<number, number>();
    for (let index = 0; index < data.length; index += 4) {
      const key = (data[index] << 24) | (data[index + 1] << 16) | (data[index + 2] << 8) | data[index + 3];
      counts.set(key, (counts.get(key) ?? 0) + 1);
    }
    const background = Math.max(...counts.values());
    return 1 - background / (data.length / 4);
  });
}

/** Share of canvas pixels close to a colour (e.g. the ramp's ember), to tell traces from axes. */
export async function canvasColourShare(page: Page, selector: string, hex: string): Promise<number> {
  return page.$eval(
    selector,
    (element, colour) => {
      const canvas = element as HTMLCanvasElement;
      const context = canvas.getContext('2d');
      if (!context || canvas.width === 0) return 0;
      const r = parseInt(colour.slice(1, 3), 16);
      const g = parseInt(colour.slice(3, 5), 16);
      const b = parseInt(colour.slice(5, 7), 16);
      const { data } = context.getImageData(0, 0, canvas.width, canvas.height);
      let near = 0;
      for (let index = 0; index < data.length; index += 4) {
        if (Math.abs(data[index] - r) + Math.abs(data[index + 1] - g) + Math.abs(data[index + 2] - b) < 60 && data[index + 3] > 200) near += 1;
      }
      return near / (data.length / 4);
    },
    hex,
  );
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(screensFolder, { recursive: true });
  const path = join(screensFolder, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}
