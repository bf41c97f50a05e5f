// ExprModel browser helpers (no inline scripts: the content security policy forbids them).
window.exprModel = {
  download: function (fileName, mimeType, text) {
    const blob = new Blob([text], { type: mimeType + ';charset=utf-8' });
    const url = URL.createObjectURL(blob);
    const a = document.createElement('a');
    a.href = url;
    a.download = fileName;
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(function () { URL.revokeObjectURL(url); }, 1000);
  }
};
window.exprModel.downloadFigure = function (id, format, fileName, height) {
  const el = document.getElementById(id);
  if (!el || !window.Plotly) return;
  return window.Plotly.downloadImage(el, { format: format, filename: fileName, height: height, width: Math.max(el.clientWidth, 600) });
};

// Plot redraw queue. The server sends each plot's newest data here; the queue keeps only the newest data per plot and
// redraws one plot per browser task, most urgent first (lowest priority number), so DOM updates from the server
// (the read-out table) are applied between redraws instead of waiting behind all of them. When a plot has been
// redrawn, its <figure> gets data-shown="revision" (the browser benchmark times the trace by it).
(function () {
  const pending = new Map();
  let draining = false;
  const config = { responsive: true, displaylogo: false };

  function next() {
    if (pending.size === 0) { draining = false; return; }
    let id = null;
    for (const [key, entry] of pending) if (id === null || entry.priority < pending.get(id).priority) id = key;
    const entry = pending.get(id);
    pending.delete(id);
    const el = document.getElementById(id);
    if (!el || !el.layout || !window.Plotly) {
      // The chart component creates the plot after its first render; wait for it (a few seconds at most).
      entry.tries = (entry.tries || 0) + 1;
      if (el && entry.tries < 200 && !pending.has(id)) pending.set(id, entry);
      setTimeout(next, 25);
      return;
    }
    const data = entry.traces.map(function (t) {
      const trace = {
        type: 'scatter', name: t.name, x: t.x, y: t.y,
        mode: t.pointsOnly ? 'markers' : t.markers ? 'lines+markers' : 'lines',
        line: { color: t.color, width: 1.6, dash: t.dashed ? 'dash' : 'solid' }
      };
      // Only scatters carry these keys: the plot library reads a present key as an object.
      if (t.pointsOnly) trace.marker = { color: t.color, size: 7 };
      if (t.labels) trace.text = t.labels;
      return trace;
    });
    // A legend for one line says nothing and costs a redraw: shown only when lines are compared.
    el.layout.showlegend = data.length > 1;
    if (typeof entry.title === 'string') el.layout.title = Object.assign({}, el.layout.title, { text: entry.title });
    Promise.resolve(window.Plotly.react(el, data, el.layout, config))
      .catch(function () { })
      .then(function () {
        const figure = el.closest('figure');
        if (figure) figure.setAttribute('data-shown', String(entry.revision));
        setTimeout(next, 0);
      });
  }

  // A new slider value makes queued redraws of the phase plane and the spike currents (priority 2 and up) stale: every
  // live run sends both again right after its read-outs' first stage, so they are dropped instead of being drawn ahead
  // of the new trace (measured on a published-model preset: trace p50 about 80 -> 60 ms, p95 about 140 -> 100 ms).
  // The trace keeps its place (it is what the user watches) and so does the f-I curve (a custom sweep is a separate job).
  document.addEventListener('input', function (e) {
    if (!(e.target instanceof HTMLInputElement) || e.target.type !== 'range') return;
    for (const [key, entry] of pending) if (entry.priority >= 2) pending.delete(key);
  }, true);

  window.exprModel.plotData = function (id, revision, priority, title, traces) {
    pending.set(id, { revision: revision, priority: priority, title: title, traces: traces });
    if (!draining) { draining = true; setTimeout(next, 0); }
  };
})();
