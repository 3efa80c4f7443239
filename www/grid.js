// latchwise pages: an editable table over a data text area (textarea[data-grid]).
// The text area stays the case (the form's value, the link, storage, Save CSV); the
// table is a view of its rows that writes each edit back into the text, leaving every
// other line (comments, blank lines) as it was. The core finds the rows, splits and
// joins cells (the same reader as the command line); only the rows in view are in the
// page, so a table of 10,000 rows scrolls and edits as quickly as one of ten.
(function () {
  'use strict';

  // One row's height in CSS pixels: the .grid-table row height in style.css.
  var ROW_PX = 30;
  // The width of a figure column, rem: col.c-figure in style.css.
  var FIGURE_REM = 8.4;
  // Rows drawn beyond each edge of the view, so that scrolling shows no gap.
  var OVERSCAN = 6;
  // The most text Undo keeps, in characters over all its snapshots: every edit of a
  // session on a table of ordinary size (a 2 kB design: 30,000 edits), and the last few
  // hundred on a 10,000-row one. When older snapshots are let go the Undo button says
  // where its history ends.
  // (A test sets window.LATCHWISE_UNDO_CHARS_MOST to reach the end of the history.)
  var UNDO_CHARS_MOST = window.LATCHWISE_UNDO_CHARS_MOST || 64 * 1024 * 1024;
  // Changes to the text from outside the table (typing in the text view, a file, the
  // demo) within this many milliseconds are undone as one.
  var BURST_MS = 1500;
  // Typing in a cell writes the text area once typing pauses this long: writing a large
  // text area's value takes longer than a frame. Until then the table's text is the case
  // (`current`), and anything that reads the text area first calls `flush`.
  var SYNC_MS = 300;

  // A count with thousands separators (10,000), without the locale machinery that a
  // first toLocaleString call loads (tens of ms, before the first result).
  function grouped(n) {
    return String(n).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  }

  function el(tag, attrs, text) {
    var e = document.createElement(tag);
    Object.keys(attrs || {}).forEach(function (k) { e.setAttribute(k, attrs[k]); });
    if (text !== undefined) e.textContent = text;
    return e;
  }

  // Problems the core reported for this field, by 0-based line, from its structured
  // problems ({table, line, columns, message}): the message text is never parsed.
  function problemsByLine(list, describe) {
    var out = {};
    (list || []).forEach(function (q) {
      if (q.line === null || q.line === undefined) return;
      var line = q.line - 1;
      var p = out[line] || (out[line] = { messages: [], columns: [] });
      p.messages.push(describe(q));
      (q.columns || []).forEach(function (c) { p.columns.push(c); });
    });
    return out;
  }

  // A problem in words, as the core writes it: "line 3, column fdata: …".
  function describeProblem(q) {
    var place = [];
    if (q.table) place.push(q.table);
    if (q.line !== null && q.line !== undefined) place.push('line ' + q.line);
    if (q.columns && q.columns.length) place.push((q.columns.length > 1 ? 'columns ' : 'column ') + q.columns.join(', '));
    return place.length ? place.join(', ') + ': ' + q.message : q.message;
  }

  function Grid(area, hooks) {
    var self = this;
    var noun = area.dataset.gridNoun || 'rows';
    var field = area.name;
    var text = null;        // the text the table shows
    var synced = null;      // the text area's value when the table last read or wrote it
    var syncTimer = null;   // a write of `text` into the text area, waiting for a pause
    var lines = [];         // its lines
    var layout = { delimiter: ',', header: null, rows: [] };
    var header = [];        // the header's cells
    var figures = null;     // { columns: [...] } for this field, or null
    var problems = {};      // by line
    var order = [];         // data row indices in display order
    var orderFor = 'file';  // the order menu's choice that `order` follows
    var selected = -1;      // a data row index
    var undo = [];
    var undoChars = 0;       // characters held by the snapshots
    var undoCut = 0;         // snapshots let go from the oldest end
    var lastOutside = 0;
    var editing = '';       // the cell being typed in, so that one cell's typing is one undo step
    var forceValues = false; // set while undoing: even the focused cell takes the text's value

    var box = el('div', { class: 'grid', id: 'grid-' + field });
    var bar = el('div', { class: 'grid-bar', role: 'toolbar', 'aria-label': noun + ' table' });
    function button(act, label, title) {
      var b = el('button', { type: 'button', 'data-act': act, title: title }, label);
      bar.appendChild(b);
      return b;
    }
    var addB = button('add', 'Add row', 'Add a row below the selected one');
    var dupB = button('duplicate', 'Duplicate', 'Copy the selected row below it');
    var delB = button('delete', 'Delete', 'Delete the selected row');
    var undoB = button('undo', 'Undo', 'Undo the last change to this table');
    var orderL = el('label', { class: 'grid-order' }, 'order ');
    var orderS = el('select', { 'data-act': 'order', 'aria-label': 'Order of the rows' });
    orderS.appendChild(el('option', { value: 'file' }, 'as in the file'));
    orderL.appendChild(orderS);
    bar.appendChild(orderL);
    var count = el('span', { class: 'grid-count', role: 'status' });
    bar.appendChild(count);
    var views = el('span', { class: 'grid-views' });
    var tableB = el('button', { type: 'button', 'data-view': 'table', 'aria-pressed': 'true' }, 'Table');
    var textB = el('button', { type: 'button', 'data-view': 'text', 'aria-pressed': 'false' }, 'CSV text');
    views.appendChild(tableB);
    views.appendChild(textB);
    bar.appendChild(views);
    var scroll = el('div', { class: 'grid-scroll', tabindex: '-1' });
    var table = el('table', { class: 'grid-table', 'aria-label': noun });
    var colgroup = el('colgroup');
    var thead = el('thead');
    var tbody = el('tbody');
    table.appendChild(colgroup);
    table.appendChild(thead);
    table.appendChild(tbody);
    scroll.appendChild(table);
    var empty = el('p', { class: 'grid-empty' });
    box.appendChild(bar);
    box.appendChild(scroll);
    box.appendChild(empty);
    area.parentNode.insertBefore(box, area);
    area.hidden = true;

    function figureColumns() { return figures ? figures.columns : []; }

    function sortable() {
      return figureColumns().filter(function (c) { return c.sorts; });
    }

    // The order menu offers each sortable figure once the case has them.
    function syncOrderMenu() {
      var want = ['file'].concat(sortable().map(function (c) { return c.key; }));
      var have = Array.prototype.map.call(orderS.options, function (o) { return o.value; });
      if (want.join() === have.join()) return;
      var keep = orderS.value;
      orderS.textContent = '';
      orderS.appendChild(el('option', { value: 'file' }, 'as in the file'));
      sortable().forEach(function (c) {
        orderS.appendChild(el('option', { value: c.key }, 'largest ' + c.label + ' first'));
      });
      orderS.value = want.indexOf(keep) >= 0 ? keep : 'file';
    }

    // The display order. While a cell of the table has the focus the order holds, so
    // that a row being edited never jumps away as its share changes.
    function computeOrder() {
      var editingNow = document.activeElement && tbody.contains(document.activeElement);
      if (editingNow && order.length === layout.rows.length && orderS.value === orderFor) return;
      orderFor = orderS.value;
      order = layout.rows.map(function (_, i) { return i; });
      var key = orderS.value;
      var col = figureColumns().filter(function (c) { return c.key === key; })[0];
      if (!col || col.values.length !== order.length) return;
      var v = col.values;
      order.sort(function (a, b) {
        // NaN (or null): the figure does not apply to the row.
        var x = v[a] === null || v[a] !== v[a] ? -Infinity : v[a];
        var y = v[b] === null || v[b] !== v[b] ? -Infinity : v[b];
        return y - x || a - b;
      });
    }

    function readText() {
      text = area.value;
      synced = text;
      lines = text.split('\n');
      layout = wasm_bindgen.table_layout(text);
      header = layout.header === null ? [] : wasm_bindgen.table_split(lines[layout.header], layout.delimiter);
      if (selected >= layout.rows.length) selected = layout.rows.length - 1;
    }

    var headDrawn = '';

    function drawHead() {
      var bad = problems[layout.header];
      var sign = JSON.stringify([header, figureColumns().map(function (c) { return c.label; }), bad || null]);
      if (sign === headDrawn) return;
      headDrawn = sign;
      colgroup.textContent = '';
      thead.textContent = '';
      var tr = el('tr');
      colgroup.appendChild(el('col', { class: 'c-line' }));
      tr.appendChild(el('th', { scope: 'col', title: 'line in the file' }, 'line'));
      header.forEach(function (h, i) {
        colgroup.appendChild(el('col', { class: i === 0 ? 'c-first' : 'c-cell' }));
        var th = el('th', { scope: 'col' }, h);
        if (bad && bad.columns.indexOf(h.toLowerCase()) >= 0) th.className = 'bad';
        tr.appendChild(th);
      });
      figureColumns().forEach(function (c, k) {
        colgroup.appendChild(el('col', { class: 'c-figure' }));
        var th = el('th', { scope: 'col', class: 'figure' }, c.label);
        th.style.right = stickyRight(k);
        tr.appendChild(th);
      });
      thead.appendChild(tr);
      if (bad) thead.title = bad.messages.join('\n'); else thead.removeAttribute('title');
    }

    // The figures stay in view at the right of a wide design (each a fixed width, see
    // col.c-figure in style.css), as the line and the name stay at the left.
    function stickyRight(k) {
      return (FIGURE_REM * (figureColumns().length - 1 - k)) + 'rem';
    }

    function figureText(c, r) {
      var v = c.values.length === layout.rows.length ? c.values[r] : null;
      return v === null || v === undefined || v !== v ? '' : wasm_bindgen.format_figure(c.kind, v);
    }

    // One data row: its line number, a cell input per header column (read-only when the
    // row's cells do not match the header: the text view mends it without losing any),
    // and the figures.
    function fillRow(tr, r, active) {
      var line = layout.rows[r];
      var figs = figureColumns().map(function (c) { return figureText(c, r); });
      var sign = lines[line] + '\u0000' + line + '\u0000' + (r === selected) + '\u0000' + header.length + '\u0000' +
        (problems[line] ? problems[line].messages.join('\n') : '') + '\u0000' + figs.join('\u0000');
      if (tr.dataset.sign === sign && !forceValues) return;
      tr.dataset.sign = sign;
      var cells = wasm_bindgen.table_split(lines[line], layout.delimiter);
      var fits = cells.length === header.length;
      tr.dataset.row = String(r);
      tr.className = (r === selected ? 'selected' : '') + (problems[line] ? ' bad' : '');
      tr.setAttribute('aria-rowindex', String(r + 2));
      var p = problems[line];
      if (p) tr.title = p.messages.join('\n'); else tr.removeAttribute('title');
      var want = 1 + header.length + figureColumns().length;
      while (tr.children.length > want) tr.lastChild.remove();
      while (tr.children.length < want) tr.appendChild(el('td'));
      tr.children[0].textContent = String(line + 1);
      tr.children[0].className = 'line';
      header.forEach(function (h, i) {
        var td = tr.children[1 + i];
        var input = td.firstChild;
        if (!input || input.tagName !== 'INPUT') {
          td.textContent = '';
          input = el('input', { 'data-col': String(i), spellcheck: 'false', autocomplete: 'off' });
          td.appendChild(input);
        }
        input.setAttribute('aria-label', h + ', line ' + (line + 1));
        input.readOnly = !fits;
        if (input !== active || forceValues) input.value = i < cells.length ? cells[i] : '';
        var badCell = p && (p.columns.indexOf(h.toLowerCase()) >= 0 || !fits);
        td.className = badCell ? 'bad' : '';
      });
      figureColumns().forEach(function (c, k) {
        var td = tr.children[1 + header.length + k];
        td.className = k === 0 ? 'figure first-figure' : 'figure';
        td.style.right = stickyRight(k);
        td.textContent = figs[k];
      });
    }

    function spacer(px) {
      var tr = el('tr', { class: 'spacer', 'aria-hidden': 'true' });
      var td = el('td', { colspan: String(1 + header.length + figureColumns().length) });
      td.style.height = px + 'px';
      tr.appendChild(td);
      return tr;
    }

    // The scroll position and the height of the view, kept from scroll events and
    // resizes so that drawing rows never waits for the page to be laid out.
    var port = { top: 0, height: ROW_PX * 12 };
    if (window.ResizeObserver) {
      new ResizeObserver(function () {
        if (scroll.clientHeight > 0) port.height = scroll.clientHeight;
      }).observe(scroll);
    }

    // The first draw comes before the page's first paint, which shows the first results:
    // it sizes the table for its rows and draws none, and the rows follow once that frame
    // is on screen (as the plots do).
    var drawnOnce = false;

    // The rows in view (and a few beyond). Rows already in the page are updated where
    // they are, so that typing in a cell is never interrupted by a redraw.
    function drawRows() {
      var later = !drawnOnce;
      if (later) {
        drawnOnce = true;
        requestAnimationFrame(function () { setTimeout(drawRows, 0); });
      }
      var first = Math.max(0, Math.floor(port.top / ROW_PX) - OVERSCAN);
      var inView = Math.ceil(port.height / ROW_PX);
      var last = later ? first : Math.min(order.length, first + inView + 2 * OVERSCAN);
      var active = document.activeElement;
      var have = {};
      Array.prototype.forEach.call(tbody.children, function (tr) {
        if (tr.dataset.row !== undefined) have[tr.dataset.row] = tr;
      });
      var rows = [];
      for (var v = first; v < last; v++) {
        var r = order[v];
        var tr = have[r] || el('tr');
        delete have[r];
        fillRow(tr, r, active);
        rows.push(tr);
      }
      var top = tbody.firstChild && tbody.firstChild.classList.contains('spacer') ? tbody.firstChild : spacer(0);
      var bottom = tbody.lastChild && tbody.lastChild !== top && tbody.lastChild.classList.contains('spacer') ? tbody.lastChild : spacer(0);
      top.firstChild.style.height = first * ROW_PX + 'px';
      bottom.firstChild.style.height = (order.length - last) * ROW_PX + 'px';
      top.firstChild.colSpan = bottom.firstChild.colSpan = 1 + header.length + figureColumns().length;
      Object.keys(have).forEach(function (k) { have[k].remove(); });
      // Place each row after the one before it, moving only rows out of place (a row
      // that holds the focus and stays in view is never moved, so it keeps the focus).
      var prev = top;
      if (tbody.firstChild !== top) tbody.insertBefore(top, tbody.firstChild);
      rows.forEach(function (tr) {
        if (prev.nextSibling !== tr) tbody.insertBefore(tr, prev.nextSibling);
        prev = tr;
      });
      if (prev.nextSibling !== bottom) tbody.insertBefore(bottom, prev.nextSibling);
      while (bottom.nextSibling) bottom.nextSibling.remove();
      table.setAttribute('aria-rowcount', String(order.length + 1));
    }

    function draw() {
      var n = layout.rows.length;
      var none = layout.header === null;
      empty.hidden = !none;
      empty.textContent = none ? 'No table yet: Add row starts one, or type, paste, drop or open a CSV file.' : '';
      scroll.hidden = none || !tableB.classList.contains('on');
      count.textContent = (n === 1 ? '1 row' : grouped(n) + ' rows') +
        (undo.length === 0 && undoCut > 0 ? ' · undo history ends here: ' + undoCut +
          ' older changes were let go (the table is large)' : '');
      dupB.disabled = delB.disabled = selected < 0;
      undoB.disabled = undo.length === 0;
      syncOrderMenu();
      computeOrder();
      drawHead();
      drawRows();
    }

    function remember(before) {
      undo.push(before);
      undoChars += before.length;
      while (undoChars > UNDO_CHARS_MOST && undo.length > 1) {
        undoChars -= undo.shift().length;
        undoCut++;
      }
      undoTitle();
    }

    // The Undo button says how far back it goes once its history has been cut.
    function undoTitle() {
      undoB.title = undoCut === 0 ? 'Undo the last change to this table' :
        'Undo the last change to this table (' + undo.length + ' more back; the ' + undoCut +
        ' oldest changes were let go, as the table is large)';
      undoB.dataset.cut = undoCut > 0 && undo.length === 0 ? 'yes' : 'no';
    }

    // Writes `text` into the text area now, unless the text area was changed from
    // outside meanwhile (its new value wins).
    function flush() {
      if (syncTimer === null) return;
      clearTimeout(syncTimer);
      syncTimer = null;
      box.removeAttribute('data-pending');
      if (area.value === synced) {
        area.value = text;
        synced = area.value;
      }
    }

    // Writes the lines back into the text area and recomputes.
    function write(next) {
      flush();
      area.value = next;
      readText();
      draw();
      hooks.changed();
    }

    function rowCells(r) {
      return wasm_bindgen.table_split(lines[layout.rows[r]], layout.delimiter);
    }

    function freshName() {
      var names = {};
      layout.rows.forEach(function (_, r) { names[rowCells(r)[0]] = true; });
      var i = layout.rows.length + 1;
      while (names['new-' + i]) i++;
      return 'new-' + i;
    }

    // Inserts `line` after data row `r` (at the end when r < 0) and selects it.
    function insertAfter(r, line) {
      remember(text);
      var at = r >= 0 ? layout.rows[r] + 1 : lines.length;
      // Keep a final newline final.
      if (r < 0 && lines.length && lines[lines.length - 1] === '') at = lines.length - 1;
      lines.splice(at, 0, line);
      selected = r >= 0 ? r + 1 : layout.rows.length;
      write(lines.join('\n'));
      reveal(selected, 1);
    }

    function act(what) {
      if (what === 'add') {
        if (layout.header === null) {
          remember(text);
          var start = (area.dataset.gridHeader || 'name').split(',');
          lines = (text.trim() === '' ? [] : lines).concat([start.join(','), '']);
          write(lines.join('\n'));
          selected = -1;
        }
        var row = header.map(function () { return ''; });
        row[0] = freshName();
        insertAfter(selected, wasm_bindgen.table_join(row, layout.delimiter));
      } else if (what === 'duplicate' && selected >= 0) {
        var copy = rowCells(selected);
        if (copy.length === header.length) copy[0] = copy[0] + '-copy';
        insertAfter(selected, wasm_bindgen.table_join(copy, layout.delimiter));
      } else if (what === 'delete' && selected >= 0) {
        remember(text);
        lines.splice(layout.rows[selected], 1);
        var was = selected;
        write(lines.join('\n'));
        selected = Math.min(was, layout.rows.length - 1);
        draw();
      } else if (what === 'undo' && undo.length) {
        forceValues = true;
        var back = undo.pop();
        undoChars -= back.length;
        try { write(back); } finally { forceValues = false; }
        undoTitle();
      }
    }

    // Scrolls data row r into view and focuses its cell `col`.
    function reveal(r, col) {
      var v = order.indexOf(r);
      if (v < 0) return;
      var top = v * ROW_PX;
      var below = port.height - ROW_PX; // below the sticky header
      if (top < port.top) scroll.scrollTop = top;
      else if (top > port.top + below - ROW_PX) scroll.scrollTop = top - below + ROW_PX;
      port.top = scroll.scrollTop;
      drawRows();
      var tr = tbody.querySelector('tr[data-row="' + r + '"]');
      var input = tr && tr.querySelector('input[data-col="' + col + '"]');
      if (input) { input.focus(); input.select(); }
    }

    function select(r) {
      if (selected === r) return;
      selected = r;
      Array.prototype.forEach.call(tbody.querySelectorAll('tr[data-row]'), function (tr) {
        tr.classList.toggle('selected', Number(tr.dataset.row) === r);
        delete tr.dataset.sign;
      });
      dupB.disabled = delB.disabled = selected < 0;
    }

    // `later`: the table is not drawn now but by the first refresh (see the end).
    function view(which, later) {
      flush();
      var table = which === 'table';
      tableB.classList.toggle('on', table);
      textB.classList.toggle('on', !table);
      tableB.setAttribute('aria-pressed', String(table));
      textB.setAttribute('aria-pressed', String(!table));
      area.hidden = table;
      [addB, dupB, delB, undoB, orderL].forEach(function (b) { b.hidden = !table; });
      box.classList.toggle('text-view', !table);
      if (table) { if (!later) self.refresh(null); } else area.focus();
    }

    bar.addEventListener('click', function (e) {
      var b = e.target.closest('button');
      if (!b) return;
      if (b.dataset.view) view(b.dataset.view); else act(b.dataset.act);
    });
    orderS.addEventListener('change', function (e) { e.stopPropagation(); orderFor = ''; draw(); });
    orderS.addEventListener('input', function (e) { e.stopPropagation(); });
    tbody.addEventListener('focusin', function (e) {
      var tr = e.target.closest('tr[data-row]');
      if (tr) select(Number(tr.dataset.row));
    });
    tbody.addEventListener('focusout', function (e) {
      editing = '';
      // Leaving the table lets a sorted order catch up with the edits.
      if (!tbody.contains(e.relatedTarget) && orderS.value !== 'file') {
        orderFor = '';
        requestAnimationFrame(draw);
      }
    });
    tbody.addEventListener('input', function (e) {
      var input = e.target;
      var tr = input.closest('tr[data-row]');
      if (!tr || input.readOnly) return;
      var r = Number(tr.dataset.row);
      var key = r + ':' + input.dataset.col;
      if (editing !== key) { remember(text); editing = key; }
      var cells = Array.prototype.map.call(tr.querySelectorAll('input[data-col]'), function (i) { return i.value; });
      lines[layout.rows[r]] = wasm_bindgen.table_join(cells, layout.delimiter);
      text = lines.join('\n');
      box.dataset.pending = 'yes';
      if (syncTimer !== null) clearTimeout(syncTimer);
      syncTimer = setTimeout(flush, SYNC_MS);
      // The form's own input listener recomputes (reading `current`); the row's line is
      // unchanged.
      undoB.disabled = false;
    });
    tbody.addEventListener('keydown', function (e) {
      var input = e.target;
      var tr = input.closest && input.closest('tr[data-row]');
      if (!tr || input.tagName !== 'INPUT') return;
      var v = order.indexOf(Number(tr.dataset.row));
      var step = e.key === 'ArrowDown' || (e.key === 'Enter' && !e.shiftKey) ? 1
        : e.key === 'ArrowUp' || (e.key === 'Enter' && e.shiftKey) ? -1 : 0;
      if (step === 0 || e.isComposing) return;
      e.preventDefault();
      var next = order[v + step];
      if (next !== undefined) reveal(next, Number(input.dataset.col));
    });
    box.addEventListener('keydown', function (e) {
      if ((e.ctrlKey || e.metaKey) && !e.shiftKey && e.key === 'z' && e.target.tagName !== 'TEXTAREA' && undo.length) {
        e.preventDefault();
        act('undo');
      }
    });
    var scrollQueued = false;
    scroll.addEventListener('scroll', function () {
      if (scrollQueued) return;
      scrollQueued = true;
      requestAnimationFrame(function () { scrollQueued = false; port.top = scroll.scrollTop; drawRows(); });
    });
    box.addEventListener('dragover', function (e) { e.preventDefault(); box.classList.add('dropping'); });
    box.addEventListener('dragleave', function () { box.classList.remove('dropping'); });
    box.addEventListener('drop', function (e) {
      e.preventDefault();
      box.classList.remove('dropping');
      var f = e.dataTransfer && e.dataTransfer.files && e.dataTransfer.files[0];
      if (f) hooks.drop(area, f);
    });

    // After each computation: the text as it now is, the figures and the problems.
    this.refresh = function (state) {
      if (state) {
        var mine = (state.figures || []).filter(function (f) { return f.field === field; })[0];
        // While the case has errors the figures' columns stay, blank, so that the
        // table does not change shape under the cell being mended.
        figures = mine || (figures && !state.ok ? {
          columns: figures.columns.map(function (c) {
            return { key: c.key, label: c.label, kind: c.kind, sorts: c.sorts, values: [] };
          })
        } : null);
        var f = (state.fields || []).filter(function (x) { return x.name === field; })[0];
        problems = problemsByLine(f && f.problems, describeProblem);
      }
      // Changed from outside the table (typed in the text view, a file, the demo, a
      // link): that text wins over any write still waiting.
      if (area.value !== synced) {
        if (syncTimer !== null) { clearTimeout(syncTimer); syncTimer = null; box.removeAttribute('data-pending'); }
        if (text !== null && Date.now() - lastOutside > BURST_MS) remember(text);
        if (text !== null) lastOutside = Date.now();
        readText();
      }
      if (!area.hidden) return;
      draw();
    };
    this.element = box;
    this.area = area;
    this.flush = flush;
    // The field's text as it now is: the table's, while its write waits for a pause.
    this.current = function () {
      return syncTimer !== null && area.value === synced ? text : area.value;
    };
    // A page that computes its first results right away says so (`hooks.drawnByRefresh`):
    // the table is then drawn once, by the refresh with the case's figures, rather than
    // twice before the first paint.
    view('table', hooks.drawnByRefresh === true);
  }

  window.LatchwiseGrid = Grid;
})();
