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
