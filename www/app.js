// latchwise pages: DOM and URL only. All parsing, validation and math happen in the
// WebAssembly core; this script moves text between the form, the URL and the core.
(function () {
  'use strict';

  // The calculator this page shows; the core's exports take it by name.
  var page = document.body.dataset.page;
  var form = document.getElementById('inputs');
  var storeKey = 'latchwise:' + page;
  var defaults = {};
  var ready = false;

  function inputs() {
    return Array.prototype.slice.call(form.querySelectorAll('input[name], select[name]'));
  }

  function query() {
    var p = new URLSearchParams();
    inputs().forEach(function (el) {
      if (el.value.trim() !== '') p.append(el.name, el.value);
    });
    return p.toString();
  }

  function fill(q) {
    var p = new URLSearchParams(q);
    inputs().forEach(function (el) {
      var all = p.getAll(el.name);
      el.value = all.length ? all[all.length - 1] : '';
    });
  }

  function show(el, on) { el.hidden = !on; }

  function fatal(msg) {
    var f = document.getElementById('fatal');
    f.textContent = msg;
    show(f, true);
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
        msg.textContent = f.text.trim() !== '' && f.normalized ? '= ' + f.normalized : '';
        msg.className = 'msg';
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
    });
    Array.prototype.forEach.call(document.querySelectorAll('output[name]'), function (out) {
      if (seen[out.getAttribute('name')]) return;
      out.textContent = state.ok ? '—' : '…';
      out.dataset.value = '';
      out.dataset.state = '';
    });
    list('warnings', state.warnings);
    list('facts', state.facts);
    if (state.ignored.length) {
      var ign = document.getElementById('ignored');
      ign.textContent = 'Ignored unknown parameters in the link: ' + state.ignored.join(', ');
      show(ign, true);
    }
    document.getElementById('caution').textContent = state.caution;
    document.body.dataset.valid = state.ok ? 'yes' : 'no';
    carryLinks();
  }

  // Explicit links to another calculator carry shared parameters, declared on the link
  // as data-carry="from:to ..." (e.g. "tau:tau fclk:fs"). The navigation carries nothing:
  // each calculator opens on its own last case.
  function carryLinks() {
    Array.prototype.forEach.call(document.querySelectorAll('a[data-carry]'), function (a) {
      var p = new URLSearchParams();
      p.append('from', page);
      a.dataset.carry.split(' ').forEach(function (pair) {
        var ends = pair.split(':');
        var el = form.elements.namedItem(ends[0]);
        if (el && el.value.trim() !== '') p.append(ends[1], el.value);
      });
      a.href = a.getAttribute('href').split('?')[0] + '?' + p.toString();
    });
  }

  function draw(q) {
    var drawn = wasm_bindgen.draw(page, q, window.devicePixelRatio || 1);
    Array.prototype.forEach.call(document.querySelectorAll('.plots canvas'), function (c) {
      c.dataset.drawn = drawn.indexOf(c.id) >= 0 ? 'yes' : 'no';
      c.parentNode.dataset.stale = c.dataset.drawn === 'yes' ? 'no' : 'yes';
    });
  }

  // Recomputes and redraws. `initial` is the page's own query on first load (it may hold
  // unknown keys to report); the plots then follow one frame after the numbers.
  function update(fromUser, initial) {
    if (!ready) return;
    var q = initial === undefined ? query() : initial;
    try {
      render(wasm_bindgen.page(page, q));
      if (initial === undefined) draw(q);
    } catch (e) {
      fatal('Internal error: ' + e + '. Your inputs are kept; please report this case: ' + location.href);
      return;
    }
    if (fromUser) {
      try { history.replaceState(null, '', '?' + q + location.hash); } catch (e) { /* file:// in some browsers */ }
      try { localStorage.setItem(storeKey, q); } catch (e) { /* storage disabled */ }
    }
  }

  function download(name, blob) {
    var a = document.createElement('a');
    a.href = URL.createObjectURL(blob);
    a.download = name;
    document.body.appendChild(a);
    a.click();
    setTimeout(function () { URL.revokeObjectURL(a.href); a.remove(); }, 0);
  }

  function wire() {
    inputs().forEach(function (el) { defaults[el.name] = el.defaultValue; });
    form.addEventListener('input', function () { update(true); });
    form.addEventListener('submit', function (e) { e.preventDefault(); });
    document.getElementById('reset').addEventListener('click', function () {
      inputs().forEach(function (el) { el.value = defaults[el.name]; });
      update(true);
    });
    document.getElementById('copy-link').addEventListener('click', function () {
      var link = location.href.split('?')[0].split('#')[0] + '?' + query();
      var status = document.getElementById('copy-status');
      var box = document.getElementById('link-text');
      box.value = link;
      function fallback() {
        show(box, true);
        box.select();
        status.textContent = 'Select and copy the link below.';
      }
      if (navigator.clipboard && window.isSecureContext) {
        navigator.clipboard.writeText(link).then(function () {
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
        var text = wasm_bindgen.csv(page, query(), t.dataset.csv);
        if (text) download(t.dataset.csv + '.csv', new Blob([text], { type: 'text/csv' }));
      } else if (t.dataset.png) {
        document.getElementById(t.dataset.png).toBlob(function (b) {
          if (b) download(t.dataset.png + '.png', b);
        });
      }
    });
    var queued = false;
    window.addEventListener('resize', function () {
      if (queued) return;
      queued = true;
      requestAnimationFrame(function () { queued = false; update(false); });
    });
  }

  function stored() {
    try { return localStorage.getItem(storeKey) || ''; } catch (e) { return ''; }
  }

  function start() {
    wire();
    var q = location.search.replace(/^\?/, '');
    var carried = new URLSearchParams(q);
    if (carried.has('from')) {
      // Arrived from another calculator: its shared values over this page's last case.
      carried.delete('from');
      var base = stored();
      if (base !== '') fill(base);
      carried.forEach(function (v, k) {
        var el = form.elements.namedItem(k);
        if (el) el.value = v;
      });
      q = query();
      try { history.replaceState(null, '', '?' + q); } catch (e) { /* file:// in some browsers */ }
    } else if (q === '') {
      q = stored();
    }
    if (q !== '') fill(q);
    var initial = q === '' ? undefined : q;
    var bytes;
    try {
      if (Uint8Array.fromBase64) {
        bytes = Uint8Array.fromBase64(window.LATCHWISE_WASM);
      } else {
        var bin = atob(window.LATCHWISE_WASM);
        bytes = new Uint8Array(bin.length);
        for (var i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
      }
    } catch (e) {
      fatal('The calculator core is missing from this copy of the site (latchwise-wasm.js).');
      return;
    }
    wasm_bindgen({ module_or_path: bytes }).then(function () {
      ready = true;
      update(false, initial === undefined ? query() : initial);
      document.body.dataset.firstResultMs = performance.now().toFixed(1);
      requestAnimationFrame(function () {
        try { draw(query()); } catch (e) { fatal('Internal error while drawing: ' + e); }
        document.body.dataset.ready = 'yes';
      });
    }, function (e) {
      fatal('The calculator core failed to start: ' + e);
    });
  }

  start();
})();
