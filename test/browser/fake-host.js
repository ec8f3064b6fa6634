/*
 * A recording fake of the pane's PaneHost (src/taskpane/host.ts), installed in the page before
 * the pane starts (window.leewayTestHost). It replaces only the workbook I/O: a tiny in-memory
 * workbook of sheets (sparse cells), and a log of every call with its arguments, which the tests
 * read back with page.evaluate(() => window.fakeWorkbook.log).
 *
 * A fill applies the plan's cells to the fake sheet (a formula cell keeps its formula and shows
 * the planner's computed result as its value), so the pane can read the filled sheet back.
 */
(function () {
  const letters = (col) => {
    let s = '';
    let n = col;
    while (n > 0) {
      const r = (n - 1) % 26;
      s = String.fromCharCode(65 + r) + s;
      n = Math.floor((n - 1) / 26);
    }
    return s;
  };
  const parseCell = (a) => {
    const m = /^\$?([A-Z]+)\$?(\d+)$/.exec(a);
    let col = 0;
    for (const ch of m[1]) col = col * 26 + (ch.charCodeAt(0) - 64);
    return { row: Number(m[2]), col };
  };
  const wb = {
    sheets: {},
    order: ['Sheet1'],
    active: 'Sheet1',
    selection: { row: 1, col: 1, rows: 1, cols: 1 },
    activeRow: 1,
    log: [],
    failNext: null,
  };
  wb.sheets.Sheet1 = new Map();
  const key = (r, c) => r + ',' + c;
  wb.setCells = function (sheet, topRow, leftCol, rows) {
    if (!wb.sheets[sheet]) {
      wb.sheets[sheet] = new Map();
      wb.order.push(sheet);
    }
    rows.forEach((row, i) => row.forEach((v, j) => {
      if (v === null || v === undefined || v === '') wb.sheets[sheet].delete(key(topRow + i, leftCol + j));
      else wb.sheets[sheet].set(key(topRow + i, leftCol + j), { value: v, formula: typeof v === 'string' && v.startsWith('=') ? v : null });
    }));
  };
  wb.cell = function (sheet, address) {
    const { row, col } = parseCell(address);
    return wb.sheets[sheet] && wb.sheets[sheet].get(key(row, col));
  };
  function used(sheet, formulas) {
    const m = wb.sheets[sheet];
    if (!m || m.size === 0) return { firstRow: 1, firstCol: 1, grid: [] };
    let r0 = Infinity, c0 = Infinity, r1 = 0, c1 = 0;
    for (const k of m.keys()) {
      const [r, c] = k.split(',').map(Number);
      r0 = Math.min(r0, r); c0 = Math.min(c0, c); r1 = Math.max(r1, r); c1 = Math.max(c1, c);
    }
    const grid = [];
    for (let r = r0; r <= r1; r++) {
      const row = [];
      for (let c = c0; c <= c1; c++) {
        const v = m.get(key(r, c));
        row.push(v ? (formulas && v.formula ? v.formula : v.value) : formulas ? null : '');
      }
      grid.push(row);
    }
    return { firstRow: r0, firstCol: c0, lastRow: r1, lastCol: c1, grid };
  }
  const rangeAddress = (sheet, r0, c0, r1, c1) => `${sheet}!${letters(c0)}${r0}${r1 > r0 || c1 > c0 ? `:${letters(c1)}${r1}` : ''}`;
  const clone = (x) => JSON.parse(JSON.stringify(x));
  async function call(name, args, f) {
    wb.log.push({ name, args: clone(args === undefined ? null : args) });
    if (wb.failNext && wb.failNext.name === name) {
      const msg = wb.failNext.message;
      wb.failNext = null;
      throw new Error(msg);
    }
    return f();
  }
  window.fakeWorkbook = wb;
  window.leewayTestHost = {
    label: 'Excel (simulated for tests)',
    available: true,
    readSelection: () => call('readSelection', null, () => {
      const s = wb.selection;
      const m = wb.sheets[wb.active];
      const values = [];
      for (let r = s.row; r < s.row + s.rows; r++) {
        const row = [];
        for (let c = s.col; c < s.col + s.cols; c++) {
          const v = m.get(key(r, c));
          row.push(v ? v.value : '');
        }
        values.push(row);
      }
      return { sheet: wb.active, address: rangeAddress(wb.active, s.row, s.col, s.row + s.rows - 1, s.col + s.cols - 1), firstRow: s.row, firstColumn: s.col, values };
    }),
    readActiveSheet: () => call('readActiveSheet', null, () => {
      const u = used(wb.active, false);
      return {
        grid: { sheet: wb.active, address: u.grid.length ? rangeAddress(wb.active, u.firstRow, u.firstCol, u.lastRow, u.lastCol) : wb.active + '!A1', firstRow: u.firstRow, firstColumn: u.firstCol, values: u.grid },
        activeRow: wb.activeRow,
      };
    }),
    readActiveCell: () => call('readActiveCell', null, () => {
      const a = wb.activeCell || { sheet: wb.active, address: 'A1' };
      const v = wb.cell(a.sheet, a.address);
      return { sheet: a.sheet, address: a.address, formula: v ? (v.formula || String(v.value)) : '', value: v ? v.value : null };
    }),
    readRanges: (refs) => call('readRanges', refs, () => refs.map((r) => {
      const sheet = r.sheet || wb.active;
      const [from, to] = r.address.split(':');
      const a = parseCell(from);
      const b = to ? parseCell(to) : a;
      const out = [];
      for (let row = a.row; row <= b.row; row++) {
        const line = [];
        for (let col = a.col; col <= b.col; col++) {
          const v = wb.sheets[sheet] && wb.sheets[sheet].get(key(row, col));
          line.push(v ? v.value : '');
        }
        out.push(line);
      }
      return out;
    })),
    sheetNames: () => call('sheetNames', null, () => wb.order.slice()),
    readTarget: () => call('readTarget', null, () => {
      const u = used(wb.active, true);
      const s = wb.selection;
      return {
        snapshot: { name: wb.active, origin: { row: u.firstRow, col: u.firstCol }, cells: u.grid },
        selection: { row: s.row, col: s.col, rows: s.rows, cols: s.cols, address: rangeAddress(wb.active, s.row, s.col, s.row + s.rows - 1, s.col + s.cols - 1) },
      };
    }),
    writeFill: (plan) => call('writeFill', plan, () => {
      if (!plan.writable) throw new Error('plan not writable');
      if (plan.target === 'new-sheet') {
        if (wb.sheets[plan.sheetName]) throw new Error('sheet exists: ' + plan.sheetName);
        wb.sheets[plan.sheetName] = new Map();
        wb.order.push(plan.sheetName);
      }
      const m = wb.sheets[plan.sheetName];
      for (const c of plan.cells) {
        const k = key(c.row, c.col);
        const ct = c.content;
        if (ct.kind === 'formula') m.set(k, { value: typeof ct.result === 'object' ? ct.result.error : ct.result, formula: ct.formula });
        else if (ct.kind === 'number') m.set(k, { value: ct.value, formula: null });
        else if (ct.kind === 'text') m.set(k, { value: ct.text, formula: null });
        else m.set(k, { value: ct.error.error, formula: null });
      }
      if (plan.blockSheet) {
        const b = new Map();
        for (const c of plan.blockSheet.cells) b.set(key(c.row, c.col), { value: c.content.kind === 'number' ? c.content.value : c.content.text, formula: null });
        wb.sheets[plan.blockSheet.name] = b;
        wb.order.push(plan.blockSheet.name);
      }
      wb.active = plan.sheetName;
      return { sheet: plan.sheetName, cells: plan.cells.length };
    }),
    setTierCell: (w) => call('setTierCell', w, () => {
      const { row, col } = parseCell(w.cell);
      wb.sheets[w.sheet].set(key(row, col), { value: w.tier, formula: null });
    }),
    writeBlock: (req) => call('writeBlock', req, () => {
      // As the Excel writer: nothing is written when a covered cell holds something, unless confirmed.
      const m = wb.sheets[req.sheet];
      if (!m) throw new Error('no sheet ' + req.sheet);
      const taken = [];
      for (const a of req.areas) a.cells.forEach((r, i) => r.forEach((_c, j) => {
        if (m.has(key(a.row + i, a.col + j))) taken.push(letters(a.col + j) + (a.row + i));
      }));
      if (taken.length && !req.overwrite) {
        const e = new Error((taken.length === 1 ? '1 cell where the block goes already holds' : taken.length + ' cells where the block goes already hold') + ' something (' + taken.slice(0, 5).join(', ') + '): nothing was written. Confirm replacing them, or make room beside the data.');
        e.name = 'OccupiedError';
        e.addresses = taken;
        throw e;
      }
      let cells = 0;
      const addresses = [];
      for (const a of req.areas) {
        addresses.push(letters(a.col) + a.row + ':' + letters(a.col + a.cells[0].length - 1) + (a.row + a.cells.length - 1));
        a.cells.forEach((r, i) => r.forEach((c, j) => {
          const k = key(a.row + i, a.col + j);
          if (!c) { if (req.overwrite) m.delete(k); return; }
          cells++;
          const ct = c.content;
          m.set(k, ct.kind === 'formula' ? { value: null, formula: ct.formula } : { value: ct.kind === 'number' ? ct.value : ct.text, formula: null });
        }));
      }
      return { sheet: req.sheet, addresses, cells, overwritten: taken };
    }),
    writeSummary: (req) => call('writeSummary', req, () => {
      let name = req.sheetName;
      for (let i = 2; wb.order.some((n) => n.toLowerCase() === name.toLowerCase()); i++) name = `${req.sheetName} (${i})`;
      wb.sheets[name] = new Map();
      wb.order.push(name);
      const headerRow = req.header.length + 2;
      return { sheet: name, tableAddress: `A${headerRow}:N${headerRow + req.rows.length}`, chartSeriesAddress: `A${headerRow}:B${headerRow + req.rows.length}` };
    }),
  };
})();
