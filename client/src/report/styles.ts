// The report's stylesheet. Colours come only from the editor theme's CSS variables,
// so the report reads in light, dark and high-contrast themes alike.
export const reportStyles = `
body { color: var(--vscode-foreground); background: var(--vscode-editor-background); font-family: var(--vscode-font-family); font-size: var(--vscode-font-size); padding: 0 1.5em 2em; }
h1 { font-size: 1.4em; margin: 0; font-family: var(--vscode-editor-font-family); }
h2 { font-size: 1.1em; margin: 1.4em 0 0.5em; }
.report-header { display: flex; flex-wrap: wrap; align-items: center; gap: 0.8em; padding-top: 1em; }
.actions { margin-left: auto; display: flex; gap: 0.5em; }
button { color: var(--vscode-button-foreground); background: var(--vscode-button-background); border: none; padding: 0.35em 0.9em; cursor: pointer; }
button:hover { background: var(--vscode-button-hoverBackground); }
button.secondary { color: var(--vscode-button-secondaryForeground); background: var(--vscode-button-secondaryBackground); }
.verdict { padding: 0.15em 0.6em; border-radius: 3px; border: 1px solid currentColor; font-weight: 600; }
.verdict-pass { color: var(--vscode-charts-green); }
.verdict-fail, .verdict-error { color: var(--vscode-charts-red); }
.verdict-inconclusive { color: var(--vscode-charts-yellow); }
.caution { border-left: 3px solid var(--vscode-charts-yellow); padding: 0.4em 0.8em; background: var(--vscode-textBlockQuote-background); }
.finding code { font-family: var(--vscode-editor-font-family); }
.severity-error code { color: var(--vscode-charts-red); }
.severity-warning code { color: var(--vscode-charts-yellow); }
.severity-info code { color: var(--vscode-charts-blue); }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; }
th, td { text-align: left; padding: 0.2em 1em 0.2em 0; border-bottom: 1px solid var(--vscode-panel-border); }
td { font-family: var(--vscode-editor-font-family); }
tr.mismatch td, .mismatch-cell { color: var(--vscode-charts-red); }
.plots { display: grid; grid-template-columns: repeat(auto-fill, minmax(420px, 1fr)); gap: 1em; }
.plots h2 { grid-column: 1 / -1; }
.plot-figure { margin: 0; }
.plot-figure figcaption { color: var(--vscode-descriptionForeground); font-size: 0.9em; }
pre { background: var(--vscode-textCodeBlock-background); padding: 0.6em; overflow: auto; }
.settings, .loading, .failure { color: var(--vscode-descriptionForeground); margin-top: 2em; }
.failure { color: var(--vscode-errorForeground); }

svg.plot { width: 100%; height: auto; max-width: 720px; font-size: 11px; font-family: var(--vscode-font-family); }
svg.plot text { fill: var(--vscode-foreground); }
svg.plot .frame { fill: none; stroke: var(--vscode-foreground); stroke-opacity: 0.5; }
svg.plot .grid { stroke: var(--vscode-foreground); stroke-opacity: 0.12; }
svg.plot .zero-line { stroke: var(--vscode-foreground); stroke-opacity: 0.45; }
svg.plot .empty-note { fill: var(--vscode-descriptionForeground); }
svg.plot .axis-label { font-size: 12px; }
svg.plot .analytic, svg.plot .analytic-swatch { fill: var(--vscode-charts-blue); }
svg.plot .numerical, svg.plot .numerical-swatch { fill: none; stroke: var(--vscode-charts-green); stroke-width: 1.5; }
svg.plot .error-bar line { stroke: var(--vscode-charts-green); stroke-width: 1.2; }
svg.plot .mismatch-band, svg.plot .mismatch-swatch { fill: var(--vscode-charts-red); fill-opacity: 0.15; }
svg.plot .mismatch-mark { fill: var(--vscode-charts-red); font-weight: 700; }
svg.plot .heat-cell { stroke: var(--vscode-editor-background); stroke-width: 1; }
svg.plot .heat-wrong { fill: var(--vscode-charts-red); }
svg.plot .heat-agrees { fill: var(--vscode-charts-green); fill-opacity: 0.25; }
svg.plot .heat-undecided { fill: var(--vscode-descriptionForeground); fill-opacity: 0.35; }
svg.plot .step-error-line { fill: none; stroke: var(--vscode-charts-blue); stroke-width: 1.5; }
svg.plot .step-point, svg.plot .step-error-swatch { fill: var(--vscode-charts-blue); }
svg.plot .chosen-step line { stroke: var(--vscode-charts-orange); stroke-dasharray: 4 3; stroke-width: 1.5; }
svg.plot .chosen-step-swatch { fill: var(--vscode-charts-orange); }
svg.plot .ritz, svg.plot .ritz-swatch { fill: var(--vscode-charts-purple); }
svg.plot .lipschitz-line line { stroke: var(--vscode-charts-red); stroke-dasharray: 6 3; }
svg.plot .lipschitz-line-swatch { fill: var(--vscode-charts-red); }
svg.plot .mu-line line { stroke: var(--vscode-charts-green); stroke-dasharray: 2 3; }
svg.plot .mu-line-swatch { fill: var(--vscode-charts-green); }
svg.plot .run-line { fill: none; stroke-width: 1.8; }
svg.plot .run-declared .run-line { stroke: var(--vscode-charts-blue); }
svg.plot .run-safe .run-line { stroke: var(--vscode-charts-green); }
svg.plot .run-limit .run-line { stroke: var(--vscode-charts-red); stroke-dasharray: 5 3; }
svg.plot .run-declared .run-end, svg.plot .run-declared-swatch { fill: var(--vscode-charts-blue); }
svg.plot .run-safe .run-end, svg.plot .run-safe-swatch { fill: var(--vscode-charts-green); }
svg.plot .run-limit .run-end, svg.plot .run-limit-swatch { fill: var(--vscode-charts-red); }
svg.plot .diverged-mark { fill: var(--vscode-charts-red); }
`;
