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
