// latchwise pages: DOM and URL only. All parsing, validation and math happen in the
// WebAssembly core; this script moves text between the form, the URL and the core.
(function () {
  'use strict';

  // The calculator this page shows; the core's exports take it by name.
  var page = document.body.dataset.page;
  var form = document.getElementById('inputs');
  var storeKey = 'latchwise:' + page;
  // A case being loaded from storage is marked here until it has shown: a mark left
  // behind means the last load never finished (the tab froze or died).
  var pendingKey = storeKey + ':loading';
  var asideKey = storeKey + ':set-aside';
  var defaults = {};
  var ready = false;
  // The editable tables over data text areas (grid.js), once the core is ready.
  var grids = [];
  var undoQuery = null;

  function each(selector, fn) {
    Array.prototype.forEach.call(document.querySelectorAll(selector), fn);
  }

  function inputs() {
    return Array.prototype.slice.call(form.querySelectorAll('input[name], select[name], textarea[name]'));
  }

  // A field's value; a data text area's from its table, which may hold edits not yet
  // written into the text area.
  function valueOf(el) {
    for (var i = 0; i < grids.length; i++) if (grids[i].area === el) return grids[i].current();
    return el.value;
  }

  // Writes every table's waiting edits into its text area, before anything reads one.
  function flushGrids() {
    grids.forEach(function (g) { g.flush(); });
  }

  // The form's fields that are not blank, in order, as [element, value].
  function given() {
    return inputs().map(function (el) { return [el, valueOf(el)]; })
      .filter(function (f) { return f[1].trim() !== ''; });
  }

  // The form for the core: the small fields as a query, the data text areas beside it
  // as they are (encoding a large design into a query and decoding it again would cost
  // more than the rest of an edit).
  function queryParts() {
    var p = new URLSearchParams();
    var names = [];
    var texts = [];
    given().forEach(function (f) {
      if (f[0].tagName === 'TEXTAREA') { names.push(f[0].name); texts.push(f[1]); } else p.append(f[0].name, f[1]);
    });
    return { plain: p.toString(), names: names, texts: texts };
  }

  // The characters of a case, as a query would hold them (about).
  function sizeOf(arg) {
    if (typeof arg === 'string') return arg.length;
    return arg.texts.reduce(function (n, t) { return n + t.length; }, arg.plain.length);
  }

  // The form as one query: what links and storage hold.
  function query() {
    var p = new URLSearchParams();
    given().forEach(function (f) { p.append(f[0].name, f[1]); });
    return p.toString();
  }

  // Fills the form from name/value pairs; the last value of a name wins, as in the core.
  function fillPairs(pairs) {
    flushGrids(); // so that what is written here is seen as a change from outside
    var last = {};
    pairs.forEach(function (kv) { last[kv[0]] = kv[1]; });
    inputs().forEach(function (el) {
      // A choice the case leaves out shows what the core reads then (data-absent), where
      // the choice has no empty option of its own.
      el.value = Object.prototype.hasOwnProperty.call(last, el.name) ? last[el.name]
        : (el.dataset.absent || '');
    });
    // The section of less common inputs opens when the case uses any of them.
    var beyond = document.getElementById('beyond');
    if (beyond) {
      beyond.open = Array.prototype.some.call(beyond.querySelectorAll('[name]'), function (el) {
        return el.value.trim() !== '';
      });
    }
  }

  // Before the core is ready the browser's reader gives the first paint; once it is,
  // the core's reader (the same as the command line's --from-url) decides.
  function fill(q) {
    if (ready) {
      fillPairs(wasm_bindgen.read_query(page, q));
    } else {
      var pairs = [];
      // A packed table (see compactQuery) waits for the core to unpack it.
      new URLSearchParams(q).forEach(function (v, k) { pairs.push([k, v.indexOf('~1') === 0 ? '' : v]); });
      fillPairs(pairs);
    }
  }

  // Writes (or with null removes) a stored value; says whether the store now holds it.
  function store(key, value) {
    try {
      if (value === null) localStorage.removeItem(key); else localStorage.setItem(key, value);
      return value === null || localStorage.getItem(key) === value;
    } catch (e) { return false; /* storage off or its quota full */ }
  }

  function stored(key) {
    try { return localStorage.getItem(key) || ''; } catch (e) { return ''; }
  }

  function show(el, on) { el.hidden = !on; }

  function fatal(msg) {
    var f = document.getElementById('fatal');
    f.textContent = msg;
    show(f, true);
  }

  function note(msg) {
    var n = document.getElementById('ignored');
    n.textContent = msg;
    show(n, msg !== '');
  }

  function list(id, items) {
    var ul = document.getElementById(id);
    if (!ul) return;
    ul.textContent = '';
    items.forEach(function (w) {
      var li = document.createElement('li');
      li.textContent = w;
      ul.appendChild(li);
    });
  }

  // The core's short table of results (the converter's errors by size), when the page
  // has a place for one; empty while the inputs are not valid.
  function resultsTable(table) {
    var t = document.getElementById('results-table');
    if (!t) return;
    t.textContent = '';
    show(t, !!table);
    if (!table) return;
    var cap = document.createElement('caption');
    cap.textContent = table.title;
    t.appendChild(cap);
    var head = document.createElement('thead');
    var tr = document.createElement('tr');
    table.header.forEach(function (h) {
      var th = document.createElement('th');
      th.scope = 'col';
      th.textContent = h;
      tr.appendChild(th);
    });
    head.appendChild(tr);
    t.appendChild(head);
    var body = document.createElement('tbody');
    table.rows.forEach(function (row) {
      var r = document.createElement('tr');
      row.forEach(function (cell) {
        var td = document.createElement('td');
        td.textContent = cell;
        r.appendChild(td);
      });
      body.appendChild(r);
    });
    t.appendChild(body);
  }

  // The label beside an output: the <dt> of its row or the label of its headline box.
  function labelOf(out) {
    var dd = out.closest('dd');
    if (dd) return dd.previousElementSibling;
    var box = out.parentNode;
    return box ? box.querySelector('.lbl') : null;
  }

  // The elements that show one result: its term and description in a list, or its box.
  function rowOf(out) {
    var dd = out.closest('dd');
    if (dd) return dd.previousElementSibling ? [dd.previousElementSibling, dd] : [dd];
    var box = out.parentNode;
    return box && box.querySelector('.lbl') ? [box] : [];
  }

  function render(state) {
    state.fields.forEach(function (f) {
      var el = form.elements.namedItem(f.name);
      var msg = document.getElementById('m-' + f.name);
      if (!el || !msg) return;
      if (f.error) {
        el.setAttribute('aria-invalid', 'true');
        msg.textContent = f.error;
        msg.className = 'msg err';
      } else {
        el.removeAttribute('aria-invalid');
        var echo = f.text.trim() !== '' && f.normalized ? '= ' + f.normalized : '';
        msg.textContent = f.note ? echo + ' — ' + f.note : echo;
        msg.className = f.note ? 'msg odd' : 'msg';
      }
    });
    inputs().forEach(function (el) {
      var box = el.closest('.field');
      if (box) box.dataset.unused = state.unused.indexOf(el.name) >= 0 ? 'yes' : 'no';
    });
    var seen = {};
    state.readouts.forEach(function (r) {
      var out = document.querySelector('output[name="' + r.name + '"]');
      if (!out) return;
      seen[r.name] = true;
      out.textContent = r.text;
      out.dataset.value = r.value === null || r.value === undefined ? '' : String(r.value);
      out.dataset.state = r.state;
      var label = labelOf(out);
      // The page writes tau as τ; relabel only when the wording itself differs.
      if (label && label.textContent.replace(/τ/g, 'tau') !== r.label) label.textContent = r.label;
    });
    // A result that does not apply to this case (the core gives no readout for it) is
    // left out of the list; while the inputs are not valid every row waits with "…".
    each('output[name]', function (out) {
      var applies = !state.ok || seen[out.getAttribute('name')] === true;
      rowOf(out).forEach(function (el) { el.hidden = !applies; });
      if (seen[out.getAttribute('name')]) return;
      out.textContent = state.ok ? '' : '…';
      out.dataset.value = '';
      out.dataset.state = '';
    });
    list('warnings', state.warnings);
    list('facts', state.facts);
    resultsTable(state.ok ? state.table : null);
    var links = document.getElementById('links');
    if (links) {
      links.textContent = '';
      state.links.forEach(function (l) {
        var li = document.createElement('li');
        var a = document.createElement('a');
        a.textContent = l[0];
        a.href = l[1];
        li.appendChild(a);
        links.appendChild(li);
      });
    }
    if (state.ignored.length) {
      var more = state.ignored_total - state.ignored.length;
      note('Ignored unknown parameters in the link: ' + state.ignored.join(', ') +
        (more > 0 ? ' and ' + more + ' more' : ''));
    }
    grids.forEach(function (g) { g.refresh(state); });
    document.getElementById('caution').textContent = state.caution;
    document.body.dataset.valid = state.ok ? 'yes' : 'no';
    carryLinks();
  }

  // Explicit links to another calculator carry shared parameters, declared on the link
  // as data-carry="from:to ..." (e.g. "tau:tau fclk:fs"). The navigation carries nothing:
  // each calculator opens on its own last case.
  function carryLinks() {
    each('a[data-carry]', function (a) {
      var p = new URLSearchParams();
      p.append('from', page);
      a.dataset.carry.split(' ').forEach(function (pair) {
        // "from:to!" carries a blank too, clearing the field there: tau given one way
        // (tau, or cl, gm and g0) replaces the other way.
        var ends = pair.split(':');
        var always = ends[1].slice(-1) === '!';
        var to = always ? ends[1].slice(0, -1) : ends[1];
        var el = form.elements.namedItem(ends[0]);
        if (el && (always || el.value.trim() !== '')) p.append(to, el.value);
      });
      a.href = a.getAttribute('href').split('?')[0] + '?' + p.toString();
    });
  }

  // Plots of a query (a string) or of query parts (see queryParts).
  function drawOnce(q, dpr) {
    // The query just computed is drawn from the core's evaluation of it, by number,
    // without handing the core its tables again; any other query, by its parts.
    var drawn = q === computed.q ? wasm_bindgen.draw_evaluation(page, computed.id, dpr) : undefined;
    if (drawn === undefined || drawn === null) {
      drawn = typeof q === 'string' ? wasm_bindgen.draw(page, q, dpr)
        : wasm_bindgen.draw_with(page, q.plain, q.names, q.texts, dpr);
    }
    each('.plots canvas', function (c) {
      c.dataset.drawn = drawn.indexOf(c.id) >= 0 ? 'yes' : 'no';
      c.parentNode.dataset.stale = c.dataset.drawn === 'yes' ? 'no' : 'yes';
    });
  }

  function draw(q) {
    var dpr = window.devicePixelRatio || 1;
    drawOnce(q, dpr);
    // Showing or hiding a plot that applies only to some cases reflows the others: draw
    // again at their new size when any drawn canvas no longer matches its box.
    var resized = Array.prototype.some.call(document.querySelectorAll('.plots canvas[data-drawn="yes"]'), function (c) {
      return Math.abs(c.width - Math.round(c.clientWidth * dpr)) > 1;
    });
    if (resized) drawOnce(q, dpr);
    document.body.dataset.drawnAt = String(performance.now());
  }

  // Numbers first, plots in the next frame; a burst of input events is one update per
  // frame (the last state of the form wins).
  var frameQueued = false;
  var plotsQueued = false;
  var saveQueued = false;

  // The plots of query `q` (the one just computed), or of the form as it is now.
  var plotQuery = null;

  function schedulePlots(q) {
    plotQuery = q === undefined ? null : q;
    if (plotsQueued) return;
    plotsQueued = true;
    requestAnimationFrame(function () {
      plotsQueued = false;
      var t0 = performance.now();
      var pq = plotQuery === null ? query() : plotQuery;
      plotQuery = null;
      try { draw(pq); } catch (e) { fatal('Internal error while drawing: ' + e); }
      // The page benchmark (scripts/bench-pages) reads the work of each frame here.
      document.body.dataset.drawMs = (performance.now() - t0).toFixed(2);
    });
  }

  // The query last computed, and the number of the core's evaluation of it.
  var computed = { q: null, id: 0 };

  // Numbers of a query (a string: a link as given) or of query parts (the form).
  function compute(q) {
    try {
      var state = typeof q === 'string' ? wasm_bindgen.page(page, q)
        : wasm_bindgen.page_with(page, q.plain, q.names, q.texts);
      computed = { q: q, id: state.evaluation };
      document.body.dataset.evaluation = String(state.evaluation);
      render(state);
      document.body.dataset.computes = String((Number(document.body.dataset.computes) || 0) + 1);
      return true;
    } catch (e) {
      fatal('Internal error: ' + e + '. Your inputs are kept; please report this case: ' + location.href);
      return false;
    }
  }

  // The print-only element of class `cls` just after `el` (made on first use), which
  // shows on paper what the control cannot.
  function printedBeside(el, tag, cls) {
    var shown = el.parentNode.querySelector(tag + '.' + cls);
    if (!shown) {
      shown = document.createElement(tag);
      shown.className = 'print-only ' + cls;
      el.parentNode.insertBefore(shown, el.nextSibling);
    }
    return shown;
  }

  // The most lines of a data text area a printed report shows.
  var PRINT_MOST_LINES = 120;

  // The longest link "Copy link" offers; see the copy-link handler.
  var LINK_MOST_CHARS = 8000;

  // The query as links and storage hold it: data tables packed (deflated) by the core
  // where that makes them shorter; the command line's --from-url reads it as well.
  function compactQuery(q) {
    return ready ? wasm_bindgen.compact_query(page, q) : q;
  }

  // Queries longer than this are saved once typing pauses, not on every frame: packing a
  // large design takes longer than a frame.
  var SAVE_AT_ONCE_CHARS = 20000;
  var saveTimer = null;

  // What a link or storage can hold and read back: a packed table unpacks to at most
  // 4 MiB (the core's link::MOST_UNPACKED), and browsers keep links of about 2 million
  // characters at most (Chromium's limit; common practice for the others).
  var UNPACKED_MOST = 4 * 1024 * 1024;
  var URL_MOST_CHARS = 2000000;
  // Where the last case could not be kept: a stored note read at the next load.
  var lostKey = storeKey + ':not-kept';

  // A standing notice that the case on screen is not kept (empty: it is).
  function unsaved(msg) {
    var n = document.getElementById('unsaved');
    if (!n) {
      n = document.createElement('p');
      n.id = 'unsaved';
      n.className = 'note unsaved';
      n.setAttribute('role', 'alert');
      var after = document.getElementById('ignored');
      after.parentNode.insertBefore(n, after.nextSibling);
    }
    n.textContent = msg;
    show(n, msg !== '');
  }

  // Saves the case into the link and the browser's storage, and says on the page when
  // either cannot hold it: never an older case brought back by a reload without a word.
  function saveNow(q) {
    var big = q.length > UNPACKED_MOST;
    var c = big ? '' : compactQuery(q);
    var inLink = !big && c.length <= URL_MOST_CHARS;
    // A link that cannot hold the case holds none, so that a reload does not bring back
    // an older one from it.
    try { history.replaceState(null, '', '?' + (inLink ? c : '') + location.hash); } catch (e) { inLink = false; }
    var kept = !big && store(storeKey, c);
    var why = [];
    if (big) {
      why.push('the case holds ' + (q.length / 1048576).toFixed(1) + ' MiB of text, more than the 4 MiB a link or this browser\'s storage carries (about 130,000 design rows)');
    } else {
      if (!inLink) why.push('its link would be ' + String(c.length).replace(/\B(?=(\d{3})+(?!\d))/g, ',') + ' characters, beyond what browsers keep (about 2 million)');
      if (!kept) why.push('this browser\'s storage did not take it (storage is off, or its quota is full)');
    }
    if (!kept) {
      // Nothing older is brought back in its place: the stored case goes, and a short
      // note says why at the next load.
      store(storeKey, null);
      store(lostKey, new Date().toISOString().slice(0, 16).replace('T', ' ') + ': ' + why.join('; '));
    } else {
      store(lostKey, null);
    }
    var then = kept ? 'A reload brings it back from this browser.' :
      inLink ? 'Its link still brings it back.' : 'A reload will not bring it back.';
    var files = document.querySelector('[data-save]') ? ' Save CSV keeps the tables as files.' : '';
    unsaved(why.length === 0 ? '' : 'This case is not kept: ' + why.join('; ') + '. ' + then + files);
  }

  function save(q) {
    if (saveTimer !== null) { clearTimeout(saveTimer); saveTimer = null; }
    if (sizeOf(q) <= SAVE_AT_ONCE_CHARS) { saveNow(typeof q === 'string' ? q : query()); return; }
    saveTimer = setTimeout(function () { saveTimer = null; saveNow(query()); }, 400);
  }

  function update(fromUser) {
    if (!ready) return;
    if (fromUser) saveQueued = true;
    if (frameQueued) return;
    frameQueued = true;
    requestAnimationFrame(function () {
      frameQueued = false;
      var t0 = performance.now();
      var q = queryParts();
      if (!compute(q)) return;
      if (saveQueued) { saveQueued = false; save(q); }
      document.body.dataset.computeMs = (performance.now() - t0).toFixed(2);
      schedulePlots(q);
    });
  }

  function download(name, blob) {
    var a = document.createElement('a');
    a.href = URL.createObjectURL(blob);
    a.download = name;
    document.body.appendChild(a);
    a.click();
    setTimeout(function () { URL.revokeObjectURL(a.href); a.remove(); }, 0);
  }

  // A data file's text into a text area, then a recompute.
  function readInto(area, file) {
    var reader = new FileReader();
    reader.onload = function () {
      flushGrids();
      area.value = String(reader.result);
      update(true);
    };
    reader.readAsText(file);
  }

  // Fills a data text area from a file the user picks (the same as dropping it there).
  function openInto(name) {
    var area = form.elements.namedItem(name);
    if (!area) return;
    var picker = document.createElement('input');
    picker.type = 'file';
    picker.accept = '.csv,.tsv,.txt,text/csv,text/plain';
    picker.hidden = true;
    picker.id = 'pick-' + name;
    picker.addEventListener('change', function () {
      var f = picker.files && picker.files[0];
      picker.remove();
      if (f) readInto(area, f);
    });
    document.body.appendChild(picker);
    picker.click();
  }

  function link() {
    return location.href.split('?')[0].split('#')[0] + '?' + compactQuery(query());
  }

  // A PNG of one plot at twice its size, with a caption naming the case.
  function png(id) {
    var src = document.getElementById(id);
    var scale = 2 * (window.devicePixelRatio || 1);
    var off = document.createElement('canvas');
    off.id = 'export-' + id;
    off.style.width = src.clientWidth + 'px';
    off.style.height = src.clientHeight + 'px';
    off.style.position = 'absolute';
    off.style.left = '-10000px';
    document.body.appendChild(off);
    try {
      wasm_bindgen.draw_plot(page, query(), id, off.id, scale);
      var caption = 'latchwise ' + page + ' · ' + new Date().toISOString().slice(0, 10) + ' · ' + link();
      var out = document.createElement('canvas');
      var pad = Math.round(14 * scale);
      out.width = off.width;
      out.height = off.height + 2 * pad;
      var g = out.getContext('2d');
      g.fillStyle = '#fff';
      g.fillRect(0, 0, out.width, out.height);
      g.drawImage(off, 0, 0);
      g.fillStyle = '#3d4650';
      g.font = Math.round(10 * scale) + 'px sans-serif';
      g.fillText(caption.length > 160 ? caption.slice(0, 157) + '…' : caption, pad / 2, off.height + pad * 1.3);
      out.toBlob(function (b) { if (b) download(id + '.png', b); });
    } finally {
      off.remove();
    }
  }

  // A data text area as printed: every line up to a page or so, then a count.
  function printText(t) {
    var lines = t.value.replace(/\s+$/, '').split('\n');
    var shown = lines.slice(0, PRINT_MOST_LINES).join('\n');
    if (lines.length > PRINT_MOST_LINES) {
      shown += '\n… and ' + (lines.length - PRINT_MOST_LINES) + ' more lines (Save CSV has them all)';
    }
    return shown;
  }

  // The page's printed sign-off report (signoff.js), from the core's report.
  function printSignoff(section, stamp) {
    var report = wasm_bindgen.report(page, query());
    if (report === null || report === undefined) {
      section.textContent = 'The inputs have errors (marked at their fields): there is no sign-off report to print.';
      return;
    }
    var corners = null;
    var area = form.elements.namedItem('corners');
    if (area && area.value.trim() !== '') {
      var l = wasm_bindgen.table_layout(area.value);
      var lines = area.value.split('\n');
      if (l.header !== null) {
        corners = {
          header: wasm_bindgen.table_split(lines[l.header], l.delimiter),
          rows: l.rows.map(function (i) { return wasm_bindgen.table_split(lines[i], l.delimiter); })
        };
      }
    }
    window.LatchwiseSignoff(section, {
      report: report,
      out: function (name) {
        var o = document.querySelector('output[name="' + name + '"]');
        return o ? o.textContent : '';
      },
      corners: corners,
      designText: function (name) { return printText(form.elements.namedItem(name)); },
      stamp: stamp,
      caution: document.getElementById('caution').textContent
    });
  }

  function wire() {
    inputs().forEach(function (el) { defaults[el.name] = el.value; });
    form.addEventListener('input', function () { update(true); });
    form.addEventListener('change', function () { update(true); });
    form.addEventListener('submit', function (e) { e.preventDefault(); });
    document.getElementById('reset').addEventListener('click', function () {
      undoQuery = query();
      flushGrids();
      inputs().forEach(function (el) { el.value = defaults[el.name]; });
      show(document.getElementById('undo'), true);
      update(true);
    });
    // Demos of other experiments: the defaults, then the experiment and its data.
    each('button[data-demo]', function (b) {
      b.addEventListener('click', function () {
        var demo = document.getElementById(b.dataset.demo);
        if (!demo) return;
        undoQuery = query();
        flushGrids();
        inputs().forEach(function (el) { el.value = defaults[el.name]; });
        form.elements.namedItem('kind').value = demo.dataset.kind;
        form.elements.namedItem('data').value = demo.value;
        show(document.getElementById('undo'), true);
        update(true);
      });
    });
    // A data file dropped on a text area fills it.
    each('textarea[name]', function (t) {
      t.addEventListener('dragover', function (e) { e.preventDefault(); t.classList.add('dropping'); });
      t.addEventListener('dragleave', function () { t.classList.remove('dropping'); });
      t.addEventListener('drop', function (e) {
        e.preventDefault();
        t.classList.remove('dropping');
        var f = e.dataTransfer && e.dataTransfer.files && e.dataTransfer.files[0];
        if (f) readInto(t, f);
      });
    });
    document.getElementById('undo').addEventListener('click', function () {
      if (undoQuery === null) return;
      fill(undoQuery);
      undoQuery = null;
      show(document.getElementById('undo'), false);
      update(true);
    });
    document.getElementById('copy-link').addEventListener('click', function () {
      var text = link();
      var status = document.getElementById('copy-status');
      var box = document.getElementById('link-text');
      if (text.length > LINK_MOST_CHARS) {
        // Common practice: many servers, proxies and mail tools cut request lines near
        // 8 KiB (from memory: Apache's LimitRequestLine defaults to 8190), so a longer
        // link may arrive cut short, silently losing rows.
        show(box, false);
        var files = document.querySelector('[data-save]') ? ' Save the design and corners as CSV files (Save CSV) and share those instead;' : '';
        status.textContent = 'This case makes a link of ' + text.length + ' characters, too long to share reliably ' +
          '(links over ' + LINK_MOST_CHARS + ' characters are often cut short).' + files +
          ' this browser keeps the case for this page.';
        return;
      }
      box.value = text;
      function fallback() {
        show(box, true);
        box.select();
        status.textContent = 'Select and copy the link below.';
      }
      if (navigator.clipboard && window.isSecureContext) {
        navigator.clipboard.writeText(text).then(function () {
          status.textContent = 'Link copied.';
        }, fallback);
      } else {
        fallback();
      }
    });
    document.addEventListener('click', function (e) {
      var t = e.target;
      if (!(t instanceof HTMLButtonElement)) return;
      if (t.dataset.csv) {
        var text = wasm_bindgen.csv(page, query(), t.dataset.csv, link());
        if (text) download(t.dataset.csv + '.csv', new Blob([text], { type: 'text/csv' }));
      } else if (t.dataset.results !== undefined) {
        // Every row at every corner, as the command's --results writes it.
        flushGrids();
        var rows = wasm_bindgen.results_csv(page, query());
        if (rows) download(page + '-' + (t.dataset.results || 'results') + '.csv', new Blob([rows], { type: 'text/csv' }));
        else note('There are no results to export until the inputs are valid.');
      } else if (t.dataset.png) {
        try { png(t.dataset.png); } catch (err) { fatal('Internal error while exporting: ' + err); }
      } else if (t.dataset.save) {
        // A data text area as the file it came from (CSV), as typed.
        var area = form.elements.namedItem(t.dataset.save);
        flushGrids();
        if (area) download(page + '-' + t.dataset.save + '.csv', new Blob([area.value], { type: 'text/csv' }));
      } else if (t.dataset.open) {
        openInto(t.dataset.open);
      } else if (t.dataset.report !== undefined) {
        var report = wasm_bindgen.report(page, query());
        if (report === null || report === undefined) {
          note('The inputs have errors (marked at their fields): there is no report to export yet.');
          return;
        }
        var doc = {
          calculator: page,
          version: wasm_bindgen.version(),
          exported: new Date().toISOString().slice(0, 19) + 'Z',
          link: link(),
          report: report
        };
        download(page + '-report.json', new Blob([JSON.stringify(doc, null, 2) + '\n'], { type: 'application/json' }));
      }
    });
    window.addEventListener('resize', function () { if (ready) schedulePlots(); });
    // Print: the date, the version and the link on the sheet, and plots drawn for paper.
    window.addEventListener('beforeprint', function () {
      flushGrids();
      var stamp = document.getElementById('print-stamp');
      if (stamp) {
        var here = link();
        if (here.length > LINK_MOST_CHARS) {
          // Beyond what a link can carry safely: the digest of the case identifies it, and
          // the CSV files are what to keep.
          here = here.split('?')[0] + ' (the link would have ' + String(here.length).replace(/\B(?=(\d{3})+(?!\d))/g, ',') +
            ' characters; SHA-256 of the case ' + wasm_bindgen.sha256_hex(query()) +
            '; keep the design and corners as CSV files: Save CSV)';
        }
        stamp.textContent = 'latchwise ' + wasm_bindgen.version() + ' · printed ' +
          new Date().toISOString().slice(0, 16).replace('T', ' ') + ' UTC · ' + here;
      }
      // A drop-down list prints its choice as text (a select clips it on paper): the
      // value as the link holds it (short), or the option's words when it has none.
      each('select[name]', function (sel) {
        var opt = sel.options[sel.selectedIndex];
        printedBeside(sel, 'span', 'print-choice').textContent =
          sel.value !== '' ? sel.value : (opt ? opt.textContent : '');
      });
      // A field prints its value as text, which wraps where a long value would be cut.
      each('input[name]', function (inp) {
        printedBeside(inp, 'span', 'print-value').textContent = inp.value;
      });
      // Data text areas print as text: every line up to a page or so, then a count.
      each('textarea[name]', function (t) {
        printedBeside(t, 'pre', 'print-text').textContent = printText(t);
      });
      var signoff = document.getElementById('signoff');
      if (signoff && window.LatchwiseSignoff) {
        try { printSignoff(signoff, stamp ? stamp.textContent : ''); } catch (e) {
          signoff.textContent = 'The sign-off report could not be built: ' + e;
        }
      }
      try { draw(query()); } catch (e) { /* the screen plots stay */ }
    });
    window.addEventListener('afterprint', function () { schedulePlots(); });
    // A save still waiting for typing to pause is made before the page goes.
    window.addEventListener('pagehide', function () {
      flushGrids();
      if (saveTimer !== null) { clearTimeout(saveTimer); saveTimer = null; saveNow(query()); }
    });
    // Once print styles apply, the canvases have their paper size: draw them at it.
    if (window.matchMedia) {
      var printing = window.matchMedia('print');
      var onPrint = function (e) {
        if (!e.matches || !ready) return;
        try { draw(query()); } catch (err) { /* the screen plots stay */ }
      };
      if (printing.addEventListener) printing.addEventListener('change', onPrint);
    }
  }

  function decodeCore() {
    if (Uint8Array.fromBase64) return Uint8Array.fromBase64(window.LATCHWISE_WASM);
    var bin = atob(window.LATCHWISE_WASM);
    var bytes = new Uint8Array(bin.length);
    for (var i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
    return bytes;
  }

  // Adds one corner (a header line and a row, CSV) to a corners table: columns the table
  // lacks are added (blank in its other rows), and a name already taken gets a number.
  // Lines are split and joined by the core, as it reads tables (quotes, delimiters and
  // comments), so a name with a comma or quote stays one cell.
  function addCorner(text, add) {
    var parts = add.split('\n');
    var addCols = wasm_bindgen.table_split(parts[0], ',');
    var addRow = wasm_bindgen.table_split(parts[1], ',');
    var body = text.replace(/\s+$/, '');
    var l = wasm_bindgen.table_layout(body);
    if (l.header === null) {
      return { text: wasm_bindgen.table_join(addCols, ',') + '\n' + wasm_bindgen.table_join(addRow, ',') + '\n', name: addRow[0] };
    }
    var delim = l.delimiter;
    var lines = body.split('\n');
    var cols = wasm_bindgen.table_split(lines[l.header], delim);
    var low = cols.map(function (c) { return c.trim().toLowerCase(); });
    var rows = l.rows.map(function (i) { return wasm_bindgen.table_split(lines[i], delim); });
    var names = rows.map(function (r) { return (r[0] || '').trim(); });
    var widened = false;
    addCols.forEach(function (c) {
      if (low.indexOf(c) >= 0) return;
      cols.push(c);
      low.push(c);
      widened = true;
      rows.forEach(function (r) { while (r.length < cols.length) r.push(''); });
    });
    // Lines are rewritten only when the table gains a column; otherwise left as typed.
    if (widened) {
      lines[l.header] = wasm_bindgen.table_join(cols, delim);
      l.rows.forEach(function (i, k) { lines[i] = wasm_bindgen.table_join(rows[k], delim); });
    }
    var name = addRow[0], n = 2;
    while (names.indexOf(name) >= 0) name = addRow[0] + n++;
    var row = low.map(function (c) {
      var k = addCols.indexOf(c);
      return c === 'corner' ? name : k >= 0 ? addRow[k] : '';
    });
    lines.push(wasm_bindgen.table_join(row, delim));
    return { text: lines.join('\n') + '\n', name: name };
  }

  // The core first (the carried corner below is split by it), then the case to show: a
  // carry link's values over this page's last case, a link, the stored case or the demo.
  function start() {
    wire();
    var bytes;
    performance.mark('latchwise:script');
    try {
      bytes = decodeCore();
      performance.mark('latchwise:decoded');
    } catch (e) {
      fatal('The calculator core is missing from this copy of the site (latchwise-' + document.body.dataset.page + '.js).');
      return;
    }
    // The module is compiled in place (its functions compile lazily, as they are first
    // called), so that the first results are in before the first paint. A browser that
    // refuses to compile on this thread gets the asynchronous way.
    var started = false;
    try {
      wasm_bindgen.initSync({ module: bytes });
      started = true;
    } catch (e) {
      started = false;
    }
    window.LATCHWISE_WASM = null;
    if (started) {
      arrive();
      return;
    }
    wasm_bindgen({ module_or_path: bytes }).then(arrive, function (e) {
      fatal('The calculator core failed to start: ' + e);
    });
  }

  function arrive() {
    performance.mark('latchwise:instantiated');
    ready = true;
    var q = location.search.replace(/^\?/, '');
    var fromStorage = false;
    var carried = new URLSearchParams(q);
    if (carried.has('from')) {
      // Arrived by an explicit carry link: its values over this page's last case.
      carried.delete('from');
      q = stored(storeKey);
      if (q !== '') fill(q);
      // A fit arriving as a budget corner: added to the corners there are, not replacing them.
      var corner = carried.get('add-corner');
      carried.delete('add-corner');
      var corners = form.elements.namedItem('corners');
      if (corner && corners) {
        var added = addCorner(corners.value, corner);
        corners.value = added.text;
        note('Corner "' + added.name + '" added from the fit (tau, the window and the range the data cover). ' +
          'Give it tsu and tcq in the corners table if the design\'s rows do not.');
      }
      carried.forEach(function (v, k) {
        var el = form.elements.namedItem(k);
        if (el) el.value = v;
      });
      q = query();
      save(q);
    } else if (q === '') {
      q = stored(storeKey);
      fromStorage = q !== '';
      var lost = stored(lostKey);
      if (!fromStorage && lost !== '') {
        note('The last case on this page was not kept (' + lost + '); the demo case is shown. ' +
          'Open its CSV files to carry on.');
        store(lostKey, null);
      }
      // The last load of this stored case never finished: set it aside, start afresh.
      if (fromStorage && stored(pendingKey) === q) {
        store(asideKey, q);
        store(storeKey, null);
        store(pendingKey, null);
        note('The last case saved in this browser did not load and was set aside; the demo case is shown. ' +
          'It is kept under "' + asideKey + '" in this site\'s storage.');
        q = '';
        fromStorage = false;
      }
    }
    if (q !== '') fill(q);
    if (fromStorage) store(pendingKey, q);
    var initial = q === '' ? query() : q;
    each('textarea[data-grid]', function (t) {
      grids.push(new window.LatchwiseGrid(t, {
        changed: function () { update(true); },
        drop: readInto,
        drawnByRefresh: true
      }));
    });
    var ok = compute(initial);
    // Drawn by the first results; drawn without figures when there are none.
    if (!ok) grids.forEach(function (g) { g.refresh(null); });
    document.body.dataset.firstResultMs = performance.now().toFixed(1);
    // The numbers are painted first; the plots are drawn once that frame is on screen.
    requestAnimationFrame(function () {
      performance.mark('latchwise:frame');
      setTimeout(function () {
        performance.mark('latchwise:shown');
        try { draw(query()); } catch (e) { fatal('Internal error while drawing: ' + e); ok = false; }
        if (fromStorage) {
          if (ok) {
            store(pendingKey, null);
          } else {
            store(asideKey, q);
            store(storeKey, null);
            store(pendingKey, null);
          }
        }
        document.body.dataset.ready = 'yes';
      }, 0);
    });
  }

  start();
})();
