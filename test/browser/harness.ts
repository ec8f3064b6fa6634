/**
 * Browser-test harness: Debian's Chromium through playwright-core (never a downloaded browser),
 * the built add-in (dist/addin) served on a localhost port by a plain http server, Office
 * simulated (a stand-in office.js that reports an Excel host) and the workbook I/O replaced by
 * the recording fake in fake-host.js. The build is refreshed with webpack when dist/addin is
 * missing or older than any source file.
 */
import * as fs from 'fs';
import * as http from 'http';
import * as path from 'path';
import { execFileSync } from 'child_process';
import type { AddressInfo } from 'net';
import type { Browser, BrowserContext, Page } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';
export const ROOT = path.resolve(__dirname, '..', '..');
export const DIST = path.join(ROOT, 'dist', 'addin');

export const hasChromium = fs.existsSync(CHROMIUM);

/** `describe` when Chromium is installed, else `describe.skip` with a message saying why. */
export function describeInBrowser(name: string, body: () => void): void {
  if (!hasChromium) {
    console.warn(`SKIPPED browser tests "${name}": ${CHROMIUM} is not installed (apt-get install chromium, or run .ci/run).`);
    describe.skip(name, body);
    return;
  }
  describe(name, body);
}

function newestMtime(dir: string): number {
  let newest = 0;
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestMtime(p));
    else newest = Math.max(newest, fs.statSync(p).mtimeMs);
  }
  return newest;
}

/** Rebuilds dist/addin with webpack when it is missing or older than src/, webpack.config.js or package.json. */
export function ensureBuild(): void {
  const built = path.join(DIST, 'taskpane.js');
  const sourceTime = Math.max(
    newestMtime(path.join(ROOT, 'src')),
    fs.statSync(path.join(ROOT, 'webpack.config.js')).mtimeMs,
    fs.statSync(path.join(ROOT, 'package.json')).mtimeMs,
  );
  const fresh = fs.existsSync(built) && fs.existsSync(path.join(DIST, 'taskpane.html')) && fs.statSync(built).mtimeMs >= sourceTime;
  if (fresh) return;
  execFileSync(process.execPath, [path.join(ROOT, 'node_modules', 'webpack', 'bin', 'webpack.js'), '--mode', 'production'], {
    cwd: ROOT,
    stdio: 'pipe',
    timeout: 180000,
  });
}

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'application/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json',
  '.png': 'image/png',
  '.svg': 'image/svg+xml',
};

/** Serves dist/addin on 127.0.0.1 (a free port); resolves to the base URL. */
export function serve(): Promise<{ url: string; close: () => Promise<void> }> {
  const server = http.createServer((req, res) => {
    const u = new URL(req.url ?? '/', 'http://localhost');
    const file = path.normalize(path.join(DIST, decodeURIComponent(u.pathname)));
    if (!file.startsWith(DIST) || !fs.existsSync(file) || fs.statSync(file).isDirectory()) {
      res.writeHead(404);
      res.end('not found');
      return;
    }
    res.writeHead(200, { 'content-type': TYPES[path.extname(file)] ?? 'application/octet-stream' });
    fs.createReadStream(file).pipe(res);
  });
  return new Promise((resolve) => {
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as AddressInfo;
      resolve({ url: `http://127.0.0.1:${port}`, close: () => new Promise((r) => server.close(() => r())) });
    });
  });
}

export async function launch(): Promise<Browser> {
  // Required lazily so the suite can be skipped without loading playwright.
  const { chromium } = require('playwright-core') as typeof import('playwright-core');
  return chromium.launch({
    executablePath: CHROMIUM,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'],
  });
}

/** A stand-in for office.js: Office.onReady reports an Excel host at once. */
export const FAKE_OFFICE_JS = `window.Office = {
  HostType: { Excel: 'Excel' },
  PlatformType: { PC: 'PC' },
  onReady: function (cb) { var info = { host: 'Excel', platform: 'PC' }; if (cb) setTimeout(function () { cb(info); }, 0); return Promise.resolve(info); },
};`;

const FAKE_HOST = fs.readFileSync(path.join(__dirname, 'fake-host.js'), 'utf8');

export interface PaneOptions {
  readonly width?: number;
  readonly height?: number;
  /** Leave office.js alone and install no fake host (the pane as a plain browser sees it). */
  readonly realOffice?: boolean;
  /** Force every text of the pane into this installed font family (appended to the pane's own stylesheet). */
  readonly fontFamily?: string;
}

/** CSS that puts every text of the pane, SVG charts included, in one font family. */
export function fontOverride(family: string): string {
  const f = `"${family.replace(/["\\]/g, '')}"`;
  return `\n:root { --font: ${f} !important; }\nhtml, body, button, input, select, textarea, svg, svg text { font-family: ${f} !important; }\n`;
}

/** The sans-serif families of this list that fontconfig reports installed (none when fc-list is absent). */
export function installedSansFamilies(candidates: readonly string[] = ['DejaVu Sans', 'Liberation Sans', 'Nimbus Sans']): string[] {
  let listed: string;
  try {
    listed = execFileSync('fc-list', [':', 'family'], { encoding: 'utf8' });
  } catch {
    return [];
  }
  const names = new Set(listed.split('\n').flatMap((l) => l.split(',')).map((n) => n.trim()));
  return candidates.filter((c) => names.has(c));
}

/** A Content-Security-Policy violation as the page reported it. */
export interface CspViolation {
  readonly directive: string;
  readonly blocked: string;
  /** The script that caused it ("" when the browser does not say). */
  readonly source: string;
}

/** Collects the page's CSP violations in window.leewayCsp (installed before any script runs). */
const CSP_COLLECTOR = `window.leewayCsp = [];
document.addEventListener('securitypolicyviolation', function (e) {
  window.leewayCsp.push({ directive: e.violatedDirective, blocked: e.blockedURI, source: e.sourceFile || '' });
});`;

/** The CSP violations the page has reported so far. */
export function cspViolations(page: Page): Promise<CspViolation[]> {
  return page.evaluate(() => (window as unknown as { leewayCsp: CspViolation[] }).leewayCsp);
}

/** Opens the pane in a fresh context (fresh storage), Office simulated; resolves once it is ready. */
export async function openPane(browser: Browser, base: string, o: PaneOptions = {}): Promise<{ context: BrowserContext; page: Page; errors: string[]; requests: string[] }> {
  const context = await browser.newContext({ viewport: { width: o.width ?? 320, height: o.height ?? 720 }, deviceScaleFactor: 1 });
  const page = await context.newPage();
  const errors: string[] = [];
  const requests: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  await page.addInitScript({ content: CSP_COLLECTOR });
  page.on('pageerror', (e) => errors.push(`pageerror: ${e.message}`));
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(`console: ${m.text()}`);
  });
  // Nothing may leave localhost.
  await context.route(/^(?!http:\/\/127\.0\.0\.1)/, (route) => {
    errors.push(`blocked request: ${route.request().url()}`);
    void route.abort();
  });
  if (o.fontFamily) {
    const css = fs.readFileSync(path.join(DIST, 'assets', 'taskpane.css'), 'utf8') + fontOverride(o.fontFamily);
    await page.route('**/assets/taskpane.css', (route) => route.fulfill({ status: 200, contentType: 'text/css; charset=utf-8', body: css }));
  }
  if (!o.realOffice) {
    await page.route('**/assets/office-js/office.js', (route) => route.fulfill({ status: 200, contentType: 'application/javascript', body: FAKE_OFFICE_JS }));
    await page.addInitScript({ content: FAKE_HOST });
  }
  await page.goto(`${base}/taskpane.html`);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 20000 });
  return { context, page, errors, requests };
}

export const SCREENSHOTS = path.join(ROOT, 'out', 'screenshots');

/** Where a test's screenshot goes: out/screenshots (never a tracked file). */
export function screenshotPath(name: string): string {
  fs.mkdirSync(SCREENSHOTS, { recursive: true });
  return path.join(SCREENSHOTS, name);
}

/**
 * One browser and one server for the describe block that calls this (built first if needed),
 * closed after it; returns the function that opens a fresh pane in it.
 */
export function usePane(): (o?: PaneOptions) => ReturnType<typeof openPane> {
  let browser: Browser | undefined;
  let server: { url: string; close: () => Promise<void> } | undefined;
  beforeAll(async () => {
    ensureBuild();
    server = await serve();
    browser = await launch();
  }, 240000);
  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });
  return (o) => openPane(browser!, server!.url, o);
}
