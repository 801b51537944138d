/** The page's stylesheet: plain, legible printed (A4/Letter, 10-11 pt), charts kept whole on a page. */
export const REPORT_CSS = `
:root{--ink:#1a1a1a;--muted:#555;--rule:#c8c8c8;--pass:#009E73;--fail:#D55E00;--note:#f4f4f0}
*{box-sizing:border-box}
body{margin:0 auto;max-width:1000px;padding:24px 20px 40px;font:15px/1.45 "DejaVu Sans","Segoe UI",Helvetica,Arial,sans-serif;color:var(--ink);background:#fff}
h1{font-size:26px;margin:0 0 4px}
h2{font-size:19px;margin:28px 0 8px;padding-bottom:3px;border-bottom:2px solid var(--ink)}
h3{font-size:16px;margin:18px 0 6px}
.sub{color:var(--muted);margin:0 0 12px}
.cautions{border:2px solid var(--ink);padding:8px 14px;margin:14px 0;background:var(--note)}
.cautions strong{display:block;margin-bottom:2px}
.cautions ul{margin:4px 0 0 18px;padding:0}
.facts{display:grid;grid-template-columns:max-content 1fr;gap:2px 14px;margin:8px 0}
.facts dt{font-weight:bold}
.facts dd{margin:0;overflow-wrap:anywhere}
.facts .alert{color:var(--fail);font-weight:bold}
.coords{border-left:4px solid var(--rule);padding:2px 0 2px 10px;margin:8px 0}
.coords .facts{margin:2px 0}
.table-box{max-width:100%;overflow-x:auto}
.stat{font-size:12px;color:var(--muted);white-space:nowrap}
table.sessions{width:100%}
table.sessions td.t{overflow-wrap:anywhere}
table{border-collapse:collapse;margin:6px 0 10px;font-size:13.5px;font-variant-numeric:tabular-nums}
th,td{border-bottom:1px solid var(--rule);padding:3px 8px;text-align:right;vertical-align:top}
th{border-bottom:2px solid var(--ink);text-align:right}
th:first-child,td:first-child,td.t,th.t{text-align:left}
td:not(.t):not(.hash){white-space:nowrap}
td.hash{font-family:"DejaVu Sans Mono",Consolas,monospace;font-size:11.5px;word-break:break-all;text-align:left}
td.path{word-break:break-all;text-align:left}
.badge{display:inline-block;white-space:nowrap;padding:0 7px;border-radius:3px;font-weight:bold;color:#fff}
.badge.pass{background:var(--pass)}.badge.fail{background:var(--fail)}.badge.other{background:#777}
.chart{margin:10px 0 18px;break-inside:avoid;page-break-inside:avoid}
.chart svg{max-width:100%;height:auto;display:block;font-size:12px;font-family:inherit}
.chart-title{font-weight:bold;margin-bottom:4px}
.chart-note{font-size:12.5px;color:var(--muted);margin:4px 0 0}
.chart .panel{fill:none;stroke:#888}
.chart .no-values{fill:#777;font-style:italic}
.chart .grid{stroke:#e2e2e2;stroke-width:1}
.chart .grid.zero{stroke:#999}
.chart text{fill:var(--ink)}
.chart .axis-label{font-weight:bold}
.chart .point-label,.chart .sat-label{font-size:11px;paint-order:stroke;stroke:#fff;stroke-width:3px}
.smalls{display:flex;flex-wrap:wrap;gap:0 18px}
.chart.small{width:300px}
.legend{list-style:none;padding:0;margin:4px 0 0;display:flex;flex-wrap:wrap;gap:2px 16px;font-size:12.5px}
.legend li{display:flex;align-items:center;gap:5px}
.missing{color:var(--muted);font-style:italic}
ul.plain{margin:4px 0 8px 18px;padding:0}
footer{margin-top:30px;color:var(--muted);font-size:12.5px;border-top:1px solid var(--rule);padding-top:6px}
@media print{
  @page{size:auto;margin:14mm 12mm}
  body{max-width:none;padding:0;font-size:10.5pt}
  h2{break-after:avoid;page-break-after:avoid}
  table,tr{break-inside:avoid;page-break-inside:avoid}
  table{font-size:8.5pt}
  .table-box{overflow:visible}
  th,td{padding:2px 4px}
  td.hash{font-size:7pt}
  .facts{font-size:10pt}
  .chart svg{max-height:190mm}
  *{-webkit-print-color-adjust:exact;print-color-adjust:exact}
  a{color:inherit;text-decoration:none}
}
`;
