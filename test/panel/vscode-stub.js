// Stand-in for the webview API, served to the panel through its allowed script path in the browser tests.
// It records what the panel posts and keeps setState across reloads in sessionStorage, as the editor does.
(function () {
  var posted = [];
  window.__posted = posted;
  document.body.classList.add('vscode-dark');
  var vars = {
    '--vscode-editor-background': '#1e1e1e',
    '--vscode-editor-foreground': '#d4d4d4',
    '--vscode-foreground': '#cccccc',
    '--vscode-charts-blue': '#3794ff',
    '--vscode-charts-orange': '#d18616',
    '--vscode-charts-green': '#89d185',
    '--vscode-charts-red': '#f14c4c',
    '--vscode-charts-purple': '#b180d7',
    '--vscode-charts-yellow': '#cca700',
    '--vscode-font-family': 'sans-serif',
    '--vscode-font-size': '13px',
  };
  Object.keys(vars).forEach(function (k) {
    document.documentElement.style.setProperty(k, vars[k]);
  });
  window.acquireVsCodeApi = function () {
    return {
      postMessage: function (m) {
        posted.push(m);
      },
      getState: function () {
        var s = sessionStorage.getItem('panel-state');
        return s ? JSON.parse(s) : undefined;
      },
      setState: function (s) {
        sessionStorage.setItem('panel-state', JSON.stringify(s));
        return s;
      },
    };
  };
})();
