// satline's page: asks the server's /v1 routes and shows their answers. It computes no
// number itself; it writes statements, sends them, and lays out what comes back.
'use strict';

(function () {
  const $ = (id) => document.getElementById(id);

  /** An element with attributes and children (strings become text, never markup). */
  function el(tag, attrs, ...children) {
    const node = document.createElement(tag);
    for (const [name, value] of Object.entries(attrs || {})) {
      if (value === null || value === undefined || value === false) continue;
      if (name === 'class') node.className = value;
      else if (name.startsWith('on')) node.addEventListener(name.slice(2), value);
      else node.setAttribute(name, value === true ? '' : String(value));
    }
    for (const child of children.flat()) {
      if (child === null || child === undefined || child === false) continue;
      node.append(child instanceof Node ? child : String(child));
    }
    return node;
  }

  const enc = encodeURIComponent;
  const pageLink = (text) => '/?q=' + enc(text);
  const jsonLink = (text) => '/v1/query?q=' + enc(text);
  const plotLink = (text) => '/v1/plot?q=' + enc(text);

  async function fetchJSON(url, options) {
    let response;
    try {
      response = await fetch(url, options);
    } catch (e) {
      return { status: 0, body: { error: { message: 'the server cannot be reached: ' + e.message } } };
    }
    let body = null;
    try {
      body = await response.json();
    } catch (e) {
      body = { error: { message: 'the reply is not JSON (status ' + response.status + ')' } };
    }
    return { status: response.status, body };
  }

  // ---------------------------------------------------------------- vocabulary

  const vocabulary = { entries: [], caution: '', examples: [], solutes: [] };

  async function loadVocabulary() {
    const { status, body } = await fetchJSON('/v1/vocabulary');
    if (status !== 200) return;
    const entries = [];
    const add = (list, kind) => list.forEach((text) => entries.push({ text, kind }));
    add(body.keywords, 'word');
    add(body.units, 'unit');
    add(body.solutes, 'solute');
    entries.sort((a, b) => a.text.localeCompare(b.text));
    vocabulary.entries = entries.filter((e, i) => i === 0 || e.text !== entries[i - 1].text);
    vocabulary.caution = body.caution;
    vocabulary.examples = body.examples;
    vocabulary.solutes = body.solutes;
    $('caution-text').textContent = body.caution;
    const names = $('solute-names');
    names.replaceChildren(...body.solutes.map((s) => el('option', { value: s })));
    $('examples').replaceChildren(...body.examples.map((text) =>
      el('li', {}, el('button', {
        type: 'button',
        onclick: () => { $('statements').value = text; run(text, true); },
      }, text))));
  }

  // ---------------------------------------------------------------- completion

  const WORDS_BACK = 4;
  const MAX_SUGGESTIONS = 12;
  const completion = { start: 0, matches: [], selected: -1 };

  /** Offsets where a completion may start in `before`: the starts of the last few words. */
  function wordStarts(before) {
    if (before === '' || /\s$/.test(before)) return [];
    const isBreak = (c) => /\s/.test(c) || c === ';' || c === '=';
    let starts = [];
    let previousBreak = true;
    for (let i = 0; i < before.length; i++) {
      const c = before[i];
      if (previousBreak && !isBreak(c)) starts.push(i);
      previousBreak = isBreak(c);
    }
    const separator = Math.max(before.lastIndexOf(';'), before.lastIndexOf('='), before.lastIndexOf('\n'));
    if (separator >= 0) starts = starts.filter((s) => s > separator);
    return starts.slice(Math.max(0, starts.length - WORDS_BACK));
  }

  /** The longest fragment before the cursor that some entry starts with, and the entries. */
  function complete(text, cursor) {
    const before = text.slice(0, cursor);
    for (const start of wordStarts(before)) {
      const fragment = before.slice(start).toLowerCase();
      const matches = vocabulary.entries.filter((e) => e.text.toLowerCase().startsWith(fragment));
      if (matches.length > 0) {
        const exact = matches.length === 1 && matches[0].text.toLowerCase() === fragment;
        return { start, matches: exact ? [] : matches.slice(0, MAX_SUGGESTIONS) };
      }
    }
    return { start: cursor, matches: [] };
  }

  function closeSuggestions() {
    completion.matches = [];
    completion.selected = -1;
    const list = $('suggestions');
    list.hidden = true;
    list.replaceChildren();
    const box = $('statements');
    box.setAttribute('aria-expanded', 'false');
    box.removeAttribute('aria-activedescendant');
  }

  function showSuggestions() {
    const box = $('statements');
    const found = complete(box.value, box.selectionStart);
    if (found.matches.length === 0 || box.selectionStart !== box.selectionEnd) {
      closeSuggestions();
      return;
    }
    completion.start = found.start;
    completion.matches = found.matches;
    completion.selected = -1;
    drawSuggestions();
  }

  function drawSuggestions() {
    const list = $('suggestions');
    list.replaceChildren(...completion.matches.map((m, i) => el('li', {
      id: 'suggestion-' + i,
      role: 'option',
      'aria-selected': i === completion.selected ? 'true' : 'false',
      onmousedown: (event) => { event.preventDefault(); accept(i); },
    }, m.text, el('span', { class: 'kind' }, m.kind))));
    list.hidden = false;
    const box = $('statements');
    box.setAttribute('aria-expanded', 'true');
    if (completion.selected >= 0) {
      box.setAttribute('aria-activedescendant', 'suggestion-' + completion.selected);
      const item = $('suggestion-' + completion.selected);
      if (item) item.scrollIntoView({ block: 'nearest' });
    } else {
      box.removeAttribute('aria-activedescendant');
    }
  }

  function accept(index) {
    const box = $('statements');
    const chosen = completion.matches[index];
    if (!chosen) return;
    const cursor = box.selectionStart;
    const after = box.value.slice(cursor);
    const space = after.startsWith(' ') || after.startsWith('\n') ? '' : ' ';
    box.value = box.value.slice(0, completion.start) + chosen.text + space + after;
    const at = completion.start + chosen.text.length + space.length;
    box.setSelectionRange(at, at);
    closeSuggestions();
    box.focus();
  }

  function onStatementKey(event) {
    if (event.key === 'Enter' && (event.ctrlKey || event.metaKey)) {
      event.preventDefault();
      closeSuggestions();
      $('query-form').requestSubmit();
      return;
    }
    const open = completion.matches.length > 0;
    if (!open) return;
    const n = completion.matches.length;
    if (event.key === 'ArrowDown') {
      event.preventDefault();
      completion.selected = (completion.selected + 1) % n;
      drawSuggestions();
    } else if (event.key === 'ArrowUp') {
      event.preventDefault();
      completion.selected = (completion.selected - 1 + n) % n;
      drawSuggestions();
    } else if (event.key === 'Tab' && !event.shiftKey) {
      event.preventDefault();
      accept(Math.max(0, completion.selected));
    } else if (event.key === 'Enter' && completion.selected >= 0) {
      event.preventDefault();
      accept(completion.selected);
    } else if (event.key === 'Escape') {
      event.preventDefault();
      closeSuggestions();
    }
  }

  // ---------------------------------------------------------------- answers

  const LABELS = {
    solute: 'solute', quantity: 'what', value: 'value', basis: 'basis', phase: 'solid phase',
    temperature_c: 'at °C', holds: 'stays dissolved', headroom_pct: 'headroom %',
    margin_pct: 'margin %', key: 'key', citation: 'citation',
  };
  const FIRST = ['solute', 'quantity', 'value', 'basis', 'phase', 'temperature_c', 'holds', 'headroom_pct', 'margin_pct'];
  const BASIS_TEXT = {
    tabulated: 'a value printed in the source',
    interpolated: 'between printed values',
    fitted: 'from a fitted equation inside its range',
    extrapolated: 'beyond the range of the data',
    computed: 'computed from other answers',
  };

  function columnsOf(rows) {
    const seen = new Set();
    rows.forEach((r) => Object.keys(r).forEach((k) => seen.add(k)));
    seen.delete('unit');
    const first = FIRST.filter((k) => seen.has(k));
    const rest = [...seen].filter((k) => !FIRST.includes(k)).sort();
    return first.concat(rest);
  }

  function show(value) {
    if (value === null || value === undefined) return '';
    if (Array.isArray(value)) return value.map(show).join(', ');
    if (typeof value === 'object') return JSON.stringify(value);
    return String(value);
  }

  function cell(row, column) {
    const value = row[column];
    if (column === 'value') {
      return el('td', { class: 'num', 'data-field': 'value', 'data-value': typeof value === 'number' ? value : null },
        value === undefined ? '' : show(value) + (row.unit ? ' ' + row.unit : ''));
    }
    if (column === 'basis' && value) {
      return el('td', { 'data-field': 'basis' },
        el('span', { class: 'basis ' + value, title: BASIS_TEXT[value] || '' }, value));
    }
    if (column === 'holds' && typeof value === 'boolean') {
      return el('td', { 'data-field': 'holds' },
        el('span', { class: value ? 'yes-text' : 'no-text' }, value ? 'yes' : 'no'));
    }
    if (column === 'source' || column === 'key') {
      return el('td', { 'data-field': column }, el('a', { href: '/?view=sources#' + enc(value) }, show(value)));
    }
    if (column === 'solute' && value) {
      return el('td', { 'data-field': column }, el('a', { href: '/?solute=' + enc(value) }, value));
    }
    const numeric = typeof value === 'number';
    return el('td', { class: numeric ? 'num' : null, 'data-field': column }, show(value));
  }

  function rowsTable(rows, columns) {
    const cols = columns || columnsOf(rows);
    return el('div', { class: 'scroll' }, el('table', { class: 'data' },
      el('thead', {}, el('tr', {}, cols.map((c) => el('th', { scope: 'col' }, LABELS[c] || c.replaceAll('_', ' '))))),
      el('tbody', {}, rows.map((r) => el('tr', { class: r.holds === false ? 'no' : null },
        cols.map((c) => cell(r, c)))))));
  }

  /** The `let` statements of a query, so a picture's statement can use the names they bind. */
  function letsOf(query) {
    return query.split(/[\n;]/).map((s) => s.trim()).filter((s) => /^let\s/i.test(s));
  }

  /**
   * The plot statement that draws a screening or require answer: its solutes' curves with
   * the loading over the storage range (the words after "dissolved at" are the same in
   * both statements).
   */
  function curveStatement(answer) {
    const tail = answer.statement.match(/\bstays?\s+dissolved\s+at\s+([\s\S]+)$/i);
    if (!tail) return null;
    let solutes;
    if (answer.kind === 'require') {
      const m = answer.statement.match(/^\s*require\s+([\s\S]+?)\s+stays?\s+dissolved\b/i);
      if (!m) return null;
      solutes = [m[1]];
    } else {
      const ranked = answer.rows.filter((r) => r.solute && typeof r.headroom_pct === 'number')
        .sort((a, b) => Math.abs(a.headroom_pct) - Math.abs(b.headroom_pct))
        .slice(0, 4);
      solutes = ranked.map((r) => r.solute);
    }
    if (solutes.length === 0) return null;
    return 'plot ' + solutes.join(', ') + ' with loading ' + tail[1].trim();
  }

  function picture(statement, query, caption) {
    const text = letsOf(query).concat([statement]).join('\n');
    return el('figure', { class: 'curve' },
      el('img', { src: plotLink(text), alt: 'Picture of: ' + statement, width: 800, height: 500, loading: 'lazy' }),
      el('figcaption', {}, caption, ' ', el('code', {}, statement), ' · ',
        el('a', { href: plotLink(text) }, 'open the SVG')));
  }

  function verdict(answer) {
    if (answer.kind === 'require' && typeof answer.holds === 'boolean') {
      const why = answer.holds
        ? (answer.rows[0] && answer.rows[0].headroom_pct !== undefined
          ? 'The saturation loading is ' + answer.rows[0].headroom_pct + ' % above this loading at the coldest point of the range.'
          : '')
        : (answer.caveats[0] || '');
      return el('p', { class: 'verdict ' + (answer.holds ? 'yes' : 'no'), 'data-holds': String(answer.holds) },
        answer.holds ? 'Stays dissolved over the whole range.' : 'Does not stay dissolved: crystals can form.',
        el('span', { class: 'why' }, why));
    }
    if (answer.kind === 'screening') {
      const held = answer.rows.filter((r) => r.holds === true).length;
      return el('p', { class: 'verdict ' + (held > 0 ? 'yes' : 'no') },
        held + ' of ' + answer.rows.length + ' stay dissolved.');
    }
    return null;
  }

  function renderAnswer(answer, query) {
    const classes = ['answer'];
    if (!answer.ok) classes.push('failed');
    if (answer.holds === true) classes.push('holds');
    if (answer.holds === false) classes.push('fails');
    const caveats = answer.caveats.filter((c) => c !== vocabulary.caution);
    const parts = [
      el('div', { class: 'answer-head' },
        el('code', { class: 'statement' }, answer.statement),
        el('span', { class: 'answer-kind' }, answer.kind)),
    ];
    if (!answer.ok && answer.error) {
      parts.push(el('p', { class: 'error', role: 'alert' }, answer.error.message,
        ' (line ' + answer.error.line + ', column ' + answer.error.column + ')'));
    }
    parts.push(verdict(answer));
    if (answer.rows.length > 0) parts.push(rowsTable(answer.rows));
    if (answer.kind === 'plot' && answer.ok) {
      parts.push(picture(answer.statement, query, 'Drawn by'));
    } else if ((answer.kind === 'require' || answer.kind === 'screening') && answer.ok) {
      const statement = curveStatement(answer);
      if (statement) parts.push(picture(statement, query, 'The curve with the loading, drawn by'));
    }
    if (caveats.length > 0) {
      parts.push(el('details', { class: 'more caveats', open: answer.holds === false },
        el('summary', {}, 'Caveats (' + caveats.length + ')'),
        el('ul', {}, caveats.map((c) => el('li', {}, c)))));
    }
    if (answer.sources.length > 0) {
      parts.push(el('details', { class: 'more citations' },
        el('summary', {}, 'Citations (' + answer.sources.length + ')'),
        el('ol', {}, answer.sources.map((s) => el('li', {},
          el('a', { class: 'key', href: '/?view=sources#' + enc(s.key) }, s.key), ': ', s.citation)))));
    }
    parts.push(el('p', { class: 'links' },
      el('a', { class: 'answer-link', href: pageLink(query) }, 'Link to this answer'),
      el('a', { class: 'json-link', href: jsonLink(query) }, 'as JSON')));
    return el('article', { class: classes.join(' '), 'data-kind': answer.kind }, parts);
  }

  let running = 0;

  async function run(text, push) {
    const query = text.trim();
    if (query === '') {
      $('status').textContent = 'Type a statement first, or pick an example.';
      return;
    }
    if (push) history.pushState(null, '', pageLink(query));
    showView('ask');
    const ticket = ++running;
    $('status').textContent = 'Answering…';
    const { status, body } = await fetchJSON(jsonLink(query));
    if (ticket !== running) return;
    const answers = Array.isArray(body) ? body : (body && body.answers) || [];
    const out = $('answers');
    out.replaceChildren(...answers.map((a) => renderAnswer(a, query)));
    if (answers.length === 0) {
      const message = (body && body.error && body.error.message) || 'no answer (status ' + status + ')';
      out.replaceChildren(el('p', { class: 'error', role: 'alert' }, message));
    }
    out.dataset.query = query;
    // On a narrow screen the answers are below the input: bring them into view.
    if (push && window.matchMedia('(max-width: 899px)').matches) $('status').scrollIntoView();
    const good = answers.filter((a) => a.ok).length;
    $('status').textContent = answers.length === 0 ? 'The query was refused.'
      : good + ' of ' + answers.length + ' statement' + (answers.length === 1 ? '' : 's') + ' answered.';
  }

  // ---------------------------------------------------------------- the form

  function number(id) {
    const text = $(id).value.trim();
    return text === '' ? NaN : Number(text);
  }

  function writeCheck() {
    const solute = $('check-solute').value.trim();
    const amount = number('check-amount');
    const from = number('check-from');
    const to = number('check-to');
    const margin = $('check-margin').value.trim() === '' ? 0 : number('check-margin');
    if (!(amount >= 0)) return { error: 'The amount must be a number, 0 or more.' };
    if (!Number.isFinite(from) || !Number.isFinite(to)) return { error: 'Give the coldest and warmest temperatures in °C.' };
    if (from > to) return { error: 'The coldest temperature is above the warmest.' };
    if (!(margin >= 0 && margin < 100)) return { error: 'The margin is a percentage from 0 up to (not including) 100.' };
    if (/[;#\n]/.test(solute)) return { error: 'The solute is one name or formula.' };
    const loading = amount + ' ' + $('check-unit').value;
    const range = from === to ? 'at ' + from + ' C' : 'from ' + from + ' C to ' + to + ' C';
    const head = solute === '' ? 'which salts stay dissolved' : 'require ' + solute + ' stays dissolved';
    return { statement: head + ' at ' + loading + ' ' + range + (margin > 0 ? ' margin ' + margin + '%' : '') };
  }

  function onCheck(event) {
    event.preventDefault();
    const written = writeCheck();
    const error = $('check-error');
    if (written.error) {
      error.textContent = written.error;
      error.hidden = false;
      return;
    }
    error.hidden = true;
    $('check-statement').textContent = written.statement;
    $('check-wrote').hidden = false;
    $('statements').value = written.statement;
    run(written.statement, true);
  }

  // ---------------------------------------------------------------- solutes and sources

  function facts(pairs) {
    return el('dl', { class: 'facts' }, pairs.filter(([, v]) => v !== null && v !== undefined && v !== '' &&
      !(Array.isArray(v) && v.length === 0)).map(([k, v]) => [el('dt', {}, k), el('dd', {}, v instanceof Node ? v : show(v))]));
  }

  function stateBadge(review) {
    return el('span', { class: 'state ' + review }, review);
  }

  async function showSolutes() {
    showView('solutes');
    const { status, body } = await fetchJSON('/v1/solutes');
    const table = $('solute-table');
    if (status !== 200) {
      table.replaceChildren(el('caption', {}, body.error ? body.error.message : 'cannot list the solutes'));
      return;
    }
    const draw = () => {
      const want = $('solute-filter').value.trim().toLowerCase();
      const list = body.solutes.filter((s) => want === '' ||
        [s.name, s.formula, s.id, s.cation, s.anion, s.kind].concat(s.tags, s.synonyms)
          .some((v) => v && String(v).toLowerCase().includes(want)));
      table.replaceChildren(
        el('caption', { class: 'visually-hidden' }, 'Solutes of the reference'),
        el('thead', {}, el('tr', {}, ['name', 'formula', 'kind', 'cation', 'anion', 'datasets', 'tags']
          .map((h) => el('th', { scope: 'col' }, h)))),
        el('tbody', {}, list.map((s) => el('tr', {},
          el('td', {}, el('a', { href: '/?solute=' + enc(s.id) }, s.name)),
          el('td', {}, s.formula), el('td', {}, s.kind), el('td', {}, s.cation || ''),
          el('td', {}, s.anion || ''), el('td', { class: 'num' }, s.datasets + s.henry),
          el('td', {}, show(s.tags))))));
    };
    $('solute-filter').oninput = draw;
    draw();
  }

  function objectList(list) {
    if (!list || list.length === 0) return null;
    return rowsTable(list, Object.keys(list[0]).filter((k) => k !== 'points'));
  }

  async function showSolute(name) {
    showView('solute');
    const target = $('solute-body');
    $('solute-title').textContent = name;
    target.replaceChildren(el('p', { class: 'status' }, 'Loading…'));
    const { status, body } = await fetchJSON('/v1/solutes/' + enc(name));
    if (status !== 200) {
      target.replaceChildren(el('p', { class: 'error', role: 'alert' }, body.error ? body.error.message : 'not found'));
      return;
    }
    const s = body.solute;
    $('solute-title').textContent = s.name + ' (' + s.formula + ')';
    document.title = s.name + ' · satline';
    const parts = [facts([
      ['id', s.id], ['formula', s.formula], ['kind', s.kind], ['cation', s.cation], ['anion', s.anion],
      ['molar mass', s.molar_mass ? s.molar_mass.toFixed(3) + ' g/mol' : null], ['synonyms', s.synonyms],
      ['tags', s.tags], ['hazard', s.hazard],
    ])];
    const ask = (text, label) => el('a', { href: pageLink(text) }, label);
    parts.push(el('p', { class: 'links' }, 'Ask: ',
      ask('describe ' + s.formula, 'describe'), ask('sources of ' + s.formula, 'sources'),
      s.kind === 'gas' ? null : ask('plot ' + s.formula, 'plot its curve')));
    if (s.kind !== 'gas' && body.datasets.length > 0) {
      parts.push(picture('plot ' + s.formula, '', 'Drawn by'));
    }
    for (const d of body.datasets) {
      const unit = d.unit;
      const tunit = d.temperature_unit;
      parts.push(el('section', { class: 'card dataset' },
        el('h2', {}, 'Dataset ', el('span', { class: 'key' }, d.key)),
        facts([
          ['solid phase', d.phase.formula + (d.phase.name ? ' (' + d.phase.name + ')' : '')],
          ['source', el('a', { href: '/?view=sources#' + enc(d.source) }, d.source)],
          ['provenance', d.provenance], ['review', stateBadge(d.review)],
          ['retired', d.retired ? 'yes' : null],
          ['stable range', d.stable_range ? show(d.stable_range) : null], ['note', d.note],
        ]),
        el('details', { class: 'more' }, el('summary', {}, 'Points (' + d.points.length + ')'),
          rowsTable(d.points.map((p) => ({
            ['temperature (' + tunit + ')']: p.temperature_reported,
            ['value (' + unit + ')']: p.value_reported,
            'mass fraction': Number(p.mass_fraction.toFixed(6)),
            uncertainty: p.uncertainty,
          }))))));
    }
    if (body.gas_constants.length > 0) {
      parts.push(el('section', { class: 'card' }, el('h2', {}, "Henry's-law records"), objectList(body.gas_constants)));
    }
    if (body.freezing.length > 0) {
      parts.push(el('section', { class: 'card' }, el('h2', {}, 'Freezing data'), objectList(body.freezing)));
    }
    parts.push(el('section', { class: 'card' }, el('h2', {}, 'Citations'),
      el('ol', { class: 'sources' }, body.sources.map((src) => el('li', {},
        el('a', { class: 'key', href: '/?view=sources#' + enc(src.key) }, src.key), ': ', src.citation)))));
    target.replaceChildren(...parts);
  }

  async function showSources() {
    showView('sources');
    const { status, body } = await fetchJSON('/v1/sources');
    const list = $('source-list');
    if (status !== 200) {
      list.replaceChildren(el('li', { class: 'error' }, body.error ? body.error.message : 'cannot list the sources'));
      return;
    }
    list.replaceChildren(...body.sources.map((s) => el('li', { id: s.key, tabindex: '-1' },
      el('span', { class: 'key' }, s.key), ' (' + s.kind + ')', el('br'), s.citation,
      s.doi ? el('span', {}, ' doi:' + s.doi) : null,
      s.note ? el('details', { class: 'more' }, el('summary', {}, 'Note'), el('p', {}, s.note)) : null)));
    const key = decodeURIComponent(location.hash.slice(1));
    const target = key && document.getElementById(key);
    if (target) { target.scrollIntoView(); target.focus(); }
  }

  // ---------------------------------------------------------------- librarian

  function token() { return sessionStorage.getItem('satline-token') || ''; }

  function authorised(options) {
    const headers = Object.assign({}, (options && options.headers) || {}, { Authorization: 'Bearer ' + token() });
    return Object.assign({}, options || {}, { headers });
  }

  async function loadQueue() {
    const say = (text) => { $('librarian-status').textContent = text; };
    say('Loading the review queue…');
    const { status, body } = await fetchJSON('/v1/admin/queue', authorised());
    if (status !== 200) {
      say(body.error ? body.error.message : 'the queue cannot be read (status ' + status + ')');
      $('queue').replaceChildren();
      return;
    }
    say(body.count === 0 ? 'Nothing is waiting for review.' : body.count + ' record(s) wait for review.');
    $('queue').replaceChildren(rowsQueue(body.records));
  }

  function rowsQueue(records) {
    if (records.length === 0) return el('p');
    return el('div', { class: 'scroll' }, el('table', { class: 'data queue' },
      el('thead', {}, el('tr', {}, ['record', 'solute', 'source', 'solid phase', 'provenance', 'points', 'decision']
        .map((h) => el('th', { scope: 'col' }, h)))),
      el('tbody', {}, records.map((r, i) => {
        const note = el('input', { 'aria-label': 'Note on ' + r.key, placeholder: 'note (what you compared)', id: 'note-' + i });
        const decide = (decision) => review(r.key, decision, note.value);
        return el('tr', {},
          el('td', {}, el('span', { class: 'key' }, r.key), ' ', r.kind === 'dataset' ? '' : '(' + r.kind + ')'),
          el('td', {}, el('a', { href: '/?solute=' + enc(r.solute) }, r.solute)),
          el('td', {}, el('a', { href: '/?view=sources#' + enc(r.source) }, r.source)),
          el('td', {}, r.phase), el('td', {}, r.provenance), el('td', { class: 'num' }, r.points),
          el('td', {}, el('span', { class: 'queue-actions' }, note,
            el('button', { type: 'button', onclick: () => decide('approve') }, 'Approve'),
            el('button', { type: 'button', onclick: () => decide('reject') }, 'Reject'))));
      }))));
  }

  async function review(key, decision, note) {
    if (note.trim() === '') {
      $('librarian-status').textContent = 'Write a note first: what you compared, and with which printed table.';
      return;
    }
    const actor = $('actor').value.trim() || undefined;
    const { status, body } = await fetchJSON('/v1/admin/review', authorised({
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ dataset: key, decision, note, actor }),
    }));
    if (status !== 200) {
      $('librarian-status').textContent = body.error ? body.error.message : 'the review was refused (status ' + status + ')';
      return;
    }
    await loadQueue();
    $('librarian-status').textContent = key + ': ' + decision + 'd by ' + body.actor + '. ' + $('librarian-status').textContent;
  }

  async function loadHistory(event) {
    event.preventDefault();
    const name = $('history-solute').value.trim();
    const out = $('history');
    if (name === '') return;
    const { status, body } = await fetchJSON('/v1/admin/history/' + enc(name), authorised());
    if (status !== 200) {
      out.replaceChildren(el('p', { class: 'error', role: 'alert' }, body.error ? body.error.message : 'status ' + status));
      return;
    }
    out.replaceChildren(el('h2', {}, 'History of ', el('span', { class: 'key' }, body.solute), ': ' + body.count + ' change(s)'),
      el('div', { class: 'scroll' }, el('table', { class: 'data' },
        el('thead', {}, el('tr', {}, ['time (UTC)', 'who', 'what', 'record', 'before and after']
          .map((h) => el('th', { scope: 'col' }, h)))),
        el('tbody', {}, body.entries.map((e) => el('tr', {},
          el('td', {}, e.time), el('td', {}, e.actor), el('td', {}, e.action), el('td', { class: 'key' }, e.entity),
          el('td', {}, el('details', { class: 'more' }, el('summary', {}, 'records'),
            el('pre', {}, 'before: ' + JSON.stringify(e.before, null, 1) + '\nafter: ' + JSON.stringify(e.after, null, 1))))))))));
  }

  // ---------------------------------------------------------------- views

  function showView(name) {
    for (const section of document.querySelectorAll('.view')) {
      section.hidden = section.id !== 'view-' + name;
    }
    for (const link of document.querySelectorAll('nav a')) {
      if (link.dataset.view === name) link.setAttribute('aria-current', 'page');
      else link.removeAttribute('aria-current');
    }
    if (name !== 'solute') document.title = 'satline: solubility reference';
  }

  function route() {
    const params = new URLSearchParams(location.search);
    if (params.has('solute')) return showSolute(params.get('solute'));
    const view = params.get('view') || 'ask';
    if (view === 'solutes') return showSolutes();
    if (view === 'sources') return showSources();
    if (view === 'librarian') { showView('librarian'); $('token').value = token(); return null; }
    showView('ask');
    if (params.has('q')) {
      $('statements').value = params.get('q');
      return run(params.get('q'), false);
    }
    return null;
  }

  /** Links within the page change the view without a reload; the back button works. */
  function onClick(event) {
    const link = event.target.closest('a');
    if (!link || event.defaultPrevented || event.button !== 0 || event.ctrlKey || event.metaKey || event.shiftKey) return;
    const url = new URL(link.href, location.href);
    if (url.origin !== location.origin || url.pathname !== '/') return;
    event.preventDefault();
    history.pushState(null, '', url.pathname + url.search + url.hash);
    route();
    $('main').focus({ preventScroll: true });
  }

  document.addEventListener('DOMContentLoaded', async () => {
    const box = $('statements');
    box.addEventListener('input', showSuggestions);
    box.addEventListener('keydown', onStatementKey);
    box.addEventListener('blur', () => setTimeout(closeSuggestions, 100));
    $('query-form').addEventListener('submit', (event) => {
      event.preventDefault();
      closeSuggestions();
      run(box.value, true);
    });
    $('check-form').addEventListener('submit', onCheck);
    $('token-form').addEventListener('submit', (event) => {
      event.preventDefault();
      sessionStorage.setItem('satline-token', $('token').value.trim());
      loadQueue();
    });
    $('history-form').addEventListener('submit', loadHistory);
    document.addEventListener('click', onClick);
    window.addEventListener('popstate', route);
    await loadVocabulary();
    await route();
    document.body.dataset.ready = 'true';
  });
})();
