#!/usr/bin/env node
// npm start: builds the add-in, builds the demo workbook and the demo review workbook, serves the add-in over HTTPS on
// localhost with generated development certificates, and sideloads it into desktop Excel where
// that exists (Windows, macOS). On Linux there is no desktop Excel: it says so, keeps serving
// and prints how to sideload the manifest by hand. It never reads standard input.
//   --no-build   serve what dist/addin holds     --port N   another port (default 3000)
//   --check      serve, fetch each page once from itself, print the result and exit (for tests)
'use strict';
const fs = require('fs');
const path = require('path');
const https = require('https');
const { execFileSync, spawn } = require('child_process');

const root = path.join(__dirname, '..');
const args = process.argv.slice(2);
const flag = (name) => args.includes(name);
const port = Number(args[args.indexOf('--port') + 1]) || 3000;
const dist = path.join(root, 'dist', 'addin');
const certDir = path.join(root, '.certs');
const say = (s) => process.stdout.write(s + '\n');

const TYPES = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.png': 'image/png',
  '.map': 'application/json',
  '.xml': 'application/xml',
};

function run(cmd, cmdArgs, label) {
  say(`• ${label}`);
  execFileSync(cmd, cmdArgs, { cwd: root, stdio: ['ignore', 'inherit', 'inherit'] });
}

async function certificates() {
  const ca = path.join(certDir, 'ca.crt');
  const cert = path.join(certDir, 'localhost.crt');
  const key = path.join(certDir, 'localhost.key');
  const fresh = fs.existsSync(cert) && Date.now() - fs.statSync(cert).mtimeMs < 25 * 24 * 3600 * 1000;
  if (!fresh) {
    say('• generating development certificates in .certs/ (office-addin-dev-certs)');
    const { generateCertificates } = require('office-addin-dev-certs/lib/generate');
    await generateCertificates(ca, cert, key, 30);
  }
  return { ca, cert: fs.readFileSync(cert), key: fs.readFileSync(key) };
}

function serve(tls) {
  const server = https.createServer({ cert: tls.cert, key: tls.key }, (req, res) => {
    const url = new URL(req.url || '/', `https://localhost:${port}`);
    const rel = decodeURIComponent(url.pathname).replace(/^\/+/, '') || 'taskpane.html';
    const file = path.normalize(path.join(dist, rel));
    if (!file.startsWith(dist) || !fs.existsSync(file) || fs.statSync(file).isDirectory()) {
      res.writeHead(404, { 'content-type': 'text/plain' });
      res.end('not found');
      return;
    }
    res.writeHead(200, {
      'content-type': TYPES[path.extname(file)] || 'application/octet-stream',
      'cache-control': 'no-cache',
      'x-content-type-options': 'nosniff',
    });
    fs.createReadStream(file).pipe(res);
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve(server));
  });
}

function selfCheck(tls) {
  const pages = ['taskpane.html', 'functions.json', 'functions.js', 'functions.html', 'commands.html', 'assets/office-js/office.js'];
  return Promise.all(
    pages.map(
      (p) =>
        new Promise((resolve) => {
          https
            .get({ host: '127.0.0.1', port, path: '/' + p, ca: fs.readFileSync(tls.ca), servername: 'localhost' }, (res) => {
              res.resume();
              resolve(`${p}: ${res.statusCode}`);
            })
            .on('error', (e) => resolve(`${p}: ${e.message}`));
        }),
    ),
  );
}

function sideloadHelp(manifest, tls) {
  return [
    'How to sideload the add-in by hand:',
    `  1. Trust the development CA once: ${tls.ca} (import it as a trusted root certificate).`,
    `  2. Excel on the web: Home > Add-ins > More Add-ins > My Add-ins > Upload My Add-in, choose ${manifest}.`,
    '     Excel on Windows: put manifest.xml in a shared-folder catalog (File > Options > Trust Center >',
    '     Trusted Add-in Catalogs), then Home > Add-ins > Shared Folder.',
    '     Excel on macOS: copy manifest.xml to ~/Library/Containers/com.microsoft.Excel/Data/Documents/wef/.',
    `  3. The add-in is served from https://localhost:${port}/ while this command runs (Ctrl+C stops it).`,
  ].join('\n');
}

async function main() {
  if (!flag('--no-build')) {
    run(process.execPath, [path.join(root, 'node_modules', 'webpack', 'bin', 'webpack.js'), '--mode', 'production', '--no-stats'], 'building the add-in (webpack) into dist/addin/');
    run(process.execPath, [path.join(root, 'scripts', 'build-cli.js')], 'building the command line into dist/cli/');
  }
  const demo = path.join(root, 'out', 'leeway-demo.xlsx');
  try {
    fs.mkdirSync(path.dirname(demo), { recursive: true });
    run(process.execPath, [path.join(root, 'bin', 'leeway.js'), 'demo', '--out', demo, '--force'], 'building the demo workbook (invented data)');
    say(`  demo workbook: ${demo}`);
  } catch {
    say('  the demo workbook could not be built (see the message above); the add-in is still served.');
  }
  const review = path.join(root, 'out', 'leeway-review-demo.xlsx');
  try {
    run(process.execPath, [path.join(root, 'bin', 'leeway.js'), 'review', '--demo', '--out', review, '--force'], 'building the demo review of control results (invented data)');
    say(`  demo review workbook: ${review}`);
  } catch {
    say('  the demo review workbook could not be built (see the message above); the add-in is still served.');
  }
  const tls = await certificates();
  const server = await serve(tls);
  const manifest = path.join(root, 'manifest.xml');
  say(`• serving the add-in at https://localhost:${port}/ (manifest: ${manifest})`);
  const desktop = process.platform === 'win32' || process.platform === 'darwin';
  if (!desktop) {
    say(`• desktop Excel does not run on ${process.platform}: the add-in cannot be sideloaded automatically here.`);
    say(sideloadHelp(manifest, tls));
  }
  if (flag('--check')) {
    for (const line of await selfCheck(tls)) say(`  ${line}`);
    server.close();
    return;
  }
  if (desktop) {
    say('• sideloading into desktop Excel (office-addin-debugging)');
    const child = spawn(process.execPath, [path.join(root, 'node_modules', 'office-addin-debugging', 'cli.js'), 'start', manifest, 'desktop', '--app', 'excel', '--no-debug', '--no-live-reload', '--dev-server-port', String(port)], { cwd: root, stdio: ['ignore', 'inherit', 'inherit'] });
    child.on('exit', (code) => {
      if (code) say(`  sideloading did not complete (exit ${code}).\n${sideloadHelp(manifest, tls)}`);
    });
  }
  const stop = () => {
    say('\n• stopped serving.');
    server.close();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((e) => {
  process.stderr.write(`npm start failed: ${e && e.message ? e.message : e}\n`);
  process.exitCode = 1;
});
