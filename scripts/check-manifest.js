#!/usr/bin/env node
// Offline manifest check (the online `office-addin-manifest validate` needs a web service).
// Checks: well-formed XML; the Id is a GUID and the version has four parts; every resid in the
// file resolves to a bt:* resource; every resource id is unique; every https URL in the
// manifest points at a file the build produced in dist/addin (origin https://localhost:3000);
// the custom-functions namespace is LEEWAY; the permission is the least one the add-in needs.
// Usage: node scripts/check-manifest.js [manifest.xml] [dist/addin]   (exit 1 on any problem)
'use strict';
const fs = require('fs');
const path = require('path');
const xml2js = require('xml2js');

const ORIGIN = 'https://localhost:3000/';

function walk(node, visit, key = '') {
  if (Array.isArray(node)) return node.forEach((n) => walk(n, visit, key));
  if (node && typeof node === 'object') {
    visit(node, key);
    for (const [k, v] of Object.entries(node)) if (k !== '$') walk(v, visit, k);
  }
}

async function checkManifest(manifestPath, distDir) {
  const problems = [];
  const text = fs.readFileSync(manifestPath, 'utf8');
  let doc;
  try {
    doc = await xml2js.parseStringPromise(text);
  } catch (e) {
    return [`not well-formed XML: ${e.message.split('\n')[0]}`];
  }
  const app = doc.OfficeApp;
  if (!app) return ['the root element is not OfficeApp'];
  const id = app.Id && app.Id[0];
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(id || '')) problems.push(`Id is not a GUID: ${id}`);
  const version = app.Version && app.Version[0];
  if (!/^\d+\.\d+\.\d+\.\d+$/.test(version || '')) problems.push(`Version must have four numeric parts: ${version}`);
  const perm = app.Permissions && app.Permissions[0];
  if (perm !== 'ReadWriteDocument') problems.push(`Permissions should be ReadWriteDocument (least needed to fill sheets), found ${perm}`);

  const resources = new Map();
  const urls = [];
  const resids = [];
  walk(app, (node, key) => {
    const a = node.$ || {};
    if (a.resid) resids.push(a.resid);
    if (a.DefaultValue && /^https?:/.test(a.DefaultValue)) urls.push(a.DefaultValue);
    if (['bt:Image', 'bt:Url', 'bt:String'].includes(key) && a.id) {
      if (resources.has(a.id)) problems.push(`resource id ${a.id} is defined twice`);
      resources.set(a.id, a.DefaultValue);
    }
  });
  for (const r of resids) if (!resources.has(r)) problems.push(`resid "${r}" does not resolve to a bt:* resource`);
  if (resources.get('Functions.Namespace') !== 'LEEWAY') problems.push('the custom-functions namespace must be LEEWAY');
  for (const u of new Set(urls)) {
    if (!u.startsWith(ORIGIN)) {
      problems.push(`URL ${u} is not served by the add-in (${ORIGIN})`);
      continue;
    }
    const file = path.join(distDir, u.slice(ORIGIN.length).split(/[?#]/)[0]);
    if (!fs.existsSync(file)) problems.push(`URL ${u} points at ${path.relative(process.cwd(), file)}, which the build did not produce`);
  }
  return problems;
}

module.exports = { checkManifest };

if (require.main === module) {
  const manifest = process.argv[2] || path.join(__dirname, '..', 'manifest.xml');
  const dist = process.argv[3] || path.join(__dirname, '..', 'dist', 'addin');
  checkManifest(manifest, dist).then((problems) => {
    for (const p of problems) console.error(`manifest: ${p}`);
    if (problems.length === 0) console.log(`manifest: ${path.relative(process.cwd(), manifest)} OK (offline check; for the online service run npm run validate:online)`);
    process.exitCode = problems.length ? 1 : 0;
  });
}
