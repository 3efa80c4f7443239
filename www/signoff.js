// latchwise pages: the printed sign-off report of a whole-design budget. Built when the
// page prints, from the core's report (the numbers of `latchwise budget --json`), the
// readouts as the page shows them, and the corners table; names are set as text only.
(function () {
  'use strict';

  // The most rows of the largest shares, and of fix-plan changes, the report lists.
  var MOST_OFFENDERS = 15;
  var MOST_CHANGES = 40;

  function el(tag, attrs, text) {
    var e = document.createElement(tag);
    Object.keys(attrs || {}).forEach(function (k) { e.setAttribute(k, attrs[k]); });
    if (text !== undefined) e.textContent = text;
    return e;
  }

  function table(head, rows, numeric) {
    var t = el('table', { class: 'signoff-table' });
    var tr = el('tr');
    head.forEach(function (h, i) { tr.appendChild(el('th', { class: numeric[i] ? 'num' : '' }, h)); });
    var thead = el('thead');
    thead.appendChild(tr);
    t.appendChild(thead);
    var body = el('tbody');
    rows.forEach(function (r) {
      var row = el('tr');
      r.forEach(function (c, i) { row.appendChild(el('td', { class: numeric[i] ? 'num' : '' }, c)); });
      body.appendChild(row);
    });
    t.appendChild(body);
    return t;
  }

  function pairs(list) {
    var dl = el('dl', { class: 'signoff-pairs' });
    list.forEach(function (p) {
      if (p[1] === null || p[1] === undefined || p[1] === '' || p[1] === '—') return;
      dl.appendChild(el('dt', {}, p[0]));
      dl.appendChild(el('dd', {}, p[1]));
    });
    return dl;
  }

  // ctx: { report, out(name) -> the page's readout text, corners -> {header, rows} or
  // null, designText(area name) -> the printed text of a data field, stamp, caution }.
  function build(section, ctx) {
    var r = ctx.report;
    var fig = function (kind, v) { return wasm_bindgen.format_figure(kind, v); };
    section.textContent = '';
    section.appendChild(el('h2', {}, 'Sign-off report: clock-domain crossings against a FIT budget'));
    section.appendChild(el('p', { class: 'signoff-meta' }, ctx.stamp));

    section.appendChild(el('h3', {}, 'Verdict'));
    // The verdict of the statistic that decides (the core's signoff), the other beside it.
    var p95 = r.signoff === 'p95';
    var verdict = r.meets_budget === undefined ? 'no budget given'
      : (r.meets_budget ? 'MEETS the budget' : 'MISSES the budget') +
        (p95 ? ' at the 95th percentile of the uncertainty of tau and tw (the sign-off statistic)'
          : ' at the nominal tau and window (the sign-off statistic chosen)');
    section.appendChild(pairs([
      ['verdict', verdict],
      ['FIT budget', r.budget_fit === undefined ? '' : fig('count', r.budget_fit)],
      ['total FIT at the worst corner', ctx.out('log10_total_fit')],
      ['worst corner', r.worst_corner],
      ['margin', ctx.out('margin_decades')],
      ['total FIT, 95th percentile under uncertainty (the sign-off figure)', ctx.out('log10_total_fit_p95')],
      ['total FIT, median under uncertainty', ctx.out('log10_total_fit_p50')]
    ]));
    if (r.meets_budget_nominal !== undefined && r.meets_budget_p95 !== undefined) {
      // The other statistic, for the record.
      var other = p95 ? r.meets_budget_nominal : r.meets_budget_p95;
      section.appendChild(el('p', { class: 'signoff-verdict ' + (other ? 'good' : 'bad') },
        (p95 ? 'At the nominal tau and window' : 'At the 95th percentile of the uncertainty of tau and tw') +
        ' the design is ' + (other ? 'within' : 'NOT within') + ' the budget (for the record; it does not decide).'));
    }

    section.appendChild(el('h3', {}, 'Inputs as understood'));
    section.appendChild(pairs(Object.keys(r.inputs).map(function (k) { return [k, r.inputs[k]]; })));

    section.appendChild(el('h3', {}, 'Corners and their totals'));
    var totals = {};
    r.corners.forEach(function (c) { totals[c.name] = fig('log10', c.log10_total_fit); });
    if (ctx.corners) {
      var head = ctx.corners.header.concat(['total FIT']);
      var rows = ctx.corners.rows.map(function (cells) {
        return cells.concat([totals[cells[0]] || '']);
      });
      section.appendChild(table(head, rows, head.map(function (_, i) { return i > 0; })));
    } else {
      section.appendChild(table(['corner', 'total FIT'], r.corners.map(function (c) {
        return [c.name, totals[c.name]];
      }), [false, true]));
    }

    section.appendChild(el('h3', {}, 'Largest shares at the worst corner (' + r.worst_corner + ')'));
    var byShare = r.rows.map(function (row, i) { return i; }).sort(function (a, b) {
      return r.rows[b].share - r.rows[a].share || a - b;
    });
    var fixed = {};
    (r.fix || []).forEach(function (f) { fixed[f.name] = f.stages; });
    var top = byShare.slice(0, MOST_OFFENDERS).map(function (i) {
      var row = r.rows[i];
      return [row.name, fig('count', row.count), row.stages === 0 ? 'tr given' : String(row.stages),
        fig('log10', row.log10_fit), fig('fraction', row.share),
        fixed[row.name] === undefined ? '' : String(fixed[row.name])];
    });
    section.appendChild(table(['crossing', 'count', 'stages', 'FIT', 'share', 'fix: stages'], top,
      [false, true, true, true, true, true]));
    if (r.rows.length > MOST_OFFENDERS) {
      var rest = byShare.slice(MOST_OFFENDERS).reduce(function (s, i) { return s + r.rows[i].share; }, 0);
      section.appendChild(el('p', { class: 'signoff-note' }, 'The other ' + (r.rows.length - MOST_OFFENDERS) +
        ' crossings together: ' + fig('fraction', rest) + ' of the total.'));
    }

    if (r.fix !== undefined) {
      section.appendChild(el('h3', {}, 'Fix plan'));
      if (r.fix === null) {
        section.appendChild(el('p', {}, (r.not_applicable && r.not_applicable.fix) || 'Adding stages cannot meet the budget.'));
      } else if (r.fix.length === 0) {
        section.appendChild(el('p', {}, 'No change needed: every corner is within the budget.'));
      } else {
        section.appendChild(pairs([
          ['flip-flops added', ctx.out('added_flip_flops')],
          ['total FIT after the fix', ctx.out('log10_total_fit_after_fix')]
        ]));
        var names = {};
        r.rows.forEach(function (row) { names[row.name] = row; });
        var changes = r.fix.slice(0, MOST_CHANGES).map(function (f) {
          var row = names[f.name];
          return [f.name, row ? String(row.stages) : '', String(f.stages), fig('count', f.added_flip_flops)];
        });
        section.appendChild(table(['crossing', 'stages now', 'stages after', 'flip-flops added'], changes,
          [false, true, true, true]));
        if (r.fix.length > MOST_CHANGES) {
          section.appendChild(el('p', { class: 'signoff-note' }, 'and ' + (r.fix.length - MOST_CHANGES) +
            ' more changes; the JSON report (Report JSON) lists every one.'));
        }
      }
    }

    if (r.log10_total_fit_p95 !== undefined) {
      section.appendChild(el('h3', {}, 'Uncertainty'));
      section.appendChild(pairs([
        ['σ of ln τ', r.inputs['tau-sigma']],
        ['σ of ln tw', r.inputs['tw-sigma']],
        ['median of the total', ctx.out('log10_total_fit_p50')],
        ['95th percentile of the total', ctx.out('log10_total_fit_p95')]
      ]));
      section.appendChild(el('p', { class: 'signoff-note' }, 'The uncertainty is systematic, shared by every ' +
        'crossing (one characterisation serves the whole chip); the percentiles are exact by quadrature. ' +
        'Sign off with the 95th percentile.'));
    }

    if (r.log10_expected_failures !== undefined) {
      section.appendChild(el('h3', {}, 'Fleet'));
      section.appendChild(pairs([
        ['devices', r.inputs.devices],
        ['years in service', r.inputs['service-years']],
        ['expected failures in the fleet', ctx.out('log10_expected_failures')],
        ['probability of at least one', ctx.out('log10_p_any_failure')]
      ]));
    }

    if (r.warnings.length) {
      section.appendChild(el('h3', {}, 'Warnings'));
      var ul = el('ul');
      r.warnings.forEach(function (w) { ul.appendChild(el('li', {}, w)); });
      section.appendChild(ul);
    }

    section.appendChild(el('h3', {}, 'Cautions'));
    section.appendChild(el('p', {}, ctx.caution));

    section.appendChild(el('h3', {}, 'The design as given (' + r.rows.length + ' crossings)'));
    section.appendChild(el('pre', { class: 'print-text' }, ctx.designText('design')));
  }

  window.LatchwiseSignoff = build;
})();
