/**
 * The report page's stylesheet, inlined into every HTML report (no external
 * requests). Screen: one readable column that narrows to a phone. Print:
 * the paper's own size (A4 or Letter), margins that fit both, no breaks inside
 * figures, table rows or fact groups, table headers repeated on each page.
 */
import { ACCENT, INK, KEY_BACKGROUND, MUTED, PROTOCOL_BACKGROUND, RULE } from "./theme.js";

export const REPORT_STYLESHEET = `
:root{color-scheme:light}
*{box-sizing:border-box}
body{font-family:"DejaVu Sans",system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;font-size:1rem;line-height:1.5;color:${INK};background:#fff;margin:0}
.page{max-width:52rem;margin:0 auto;padding:1.5rem 1rem 3rem}
a{color:${ACCENT}}
header.report-head{border-bottom:2px solid ${ACCENT};padding-bottom:.75rem;margin-bottom:1rem}
.eyebrow{text-transform:uppercase;letter-spacing:.06em;font-size:.75rem;color:${MUTED};margin:0}
.eyebrow .id{text-transform:none;letter-spacing:0}
h1{font-size:1.7rem;line-height:1.2;margin:.25rem 0 .35rem;overflow-wrap:anywhere}
.design-name{font-size:1.05rem;margin:0;color:${ACCENT};font-weight:600}
.question{font-size:1.1rem;margin:.75rem 0 0}
h2{font-size:1.2rem;margin:2rem 0 .6rem;padding-bottom:.2rem;border-bottom:1px solid ${RULE};break-after:avoid;page-break-after:avoid}
nav.contents{font-size:.9rem;margin:.75rem 0 0}
nav.contents ol{margin:.25rem 0;padding-left:1.2rem;columns:2 14rem}
.formats{font-size:.9rem;margin:.5rem 0 0}
.formats a{margin-right:.75rem;white-space:nowrap}
dl.facts{margin:.75rem 0}
dl.facts div{display:grid;grid-template-columns:minmax(9rem,2fr) 3fr;gap:1rem;padding:.2rem 0;border-bottom:1px dotted ${RULE}}
dl.facts dt{font-weight:600}
dl.facts dd{margin:0;overflow-wrap:anywhere;font-variant-numeric:tabular-nums}
dl.facts small{color:${MUTED}}
dl.key{display:grid;grid-template-columns:repeat(auto-fill,minmax(11rem,1fr));gap:.6rem;margin:.75rem 0}
dl.key div{background:${KEY_BACKGROUND};border:1px solid ${RULE};border-radius:4px;padding:.5rem .7rem;break-inside:avoid}
dl.key dt{font-size:.8rem;color:${MUTED};font-weight:400}
dl.key dd{margin:0;font-size:1.35rem;font-weight:700;font-variant-numeric:tabular-nums}
dl.key dd.long{font-size:1rem;line-height:1.35}
dl.key small{display:block;font-size:.75rem;font-weight:400;color:${MUTED}}
.table-wrap{overflow-x:auto;margin:.75rem 0}
table{border-collapse:collapse;font-size:.9rem;min-width:50%}
caption{text-align:left;font-weight:600;padding:.25rem 0;caption-side:top}
th,td{border-bottom:1px solid ${RULE};padding:.3rem .6rem;text-align:left;vertical-align:top}
thead th{border-bottom:2px solid ${INK};font-weight:600;vertical-align:bottom}
tbody th{font-weight:400}
td.num,th.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
tbody tr:nth-child(even){background:#fafafa}
.table-note{font-size:.85rem;color:${MUTED};margin:.25rem 0 0}
.csv{font-size:.8rem;font-weight:400;margin-left:.5rem}
code{font-family:"DejaVu Sans Mono",ui-monospace,monospace;font-size:.88em}
figure{margin:1rem 0;break-inside:avoid;page-break-inside:avoid}
figcaption{font-weight:600;margin-bottom:.25rem}
svg.chart{width:100%;height:auto;max-width:44rem;display:block}
.chart-narrow{display:none}
blockquote.protocol{border-left:4px solid ${ACCENT};margin:.75rem 0;padding:.6rem 1rem;background:${PROTOCOL_BACKGROUND}}
.citation{font-family:"DejaVu Sans Mono",ui-monospace,monospace;font-size:.85rem;background:${KEY_BACKGROUND};padding:.6rem .8rem;border:1px solid ${RULE};overflow-wrap:anywhere}
section#caution{border:1px solid #b9a36a;background:#fbf7ea;padding:.1rem 1rem .5rem;margin-top:2rem;border-radius:4px}
section#caution h2{border:0}
ol.references li,ul li{margin:.2rem 0}
footer.report-foot{margin-top:2rem;font-size:.8rem;color:${MUTED};border-top:1px solid ${RULE};padding-top:.5rem;overflow-wrap:anywhere}
@media (max-width:36rem){
  .page{padding:1rem .75rem 2rem}
  h1{font-size:1.4rem}
  dl.facts div{grid-template-columns:1fr;gap:0}
  table{font-size:.82rem}
  th,td{padding:.25rem .4rem}
  .chart-wide{display:none}
  .chart-narrow{display:block}
  table.stack,table.stack caption,table.stack tbody,table.stack tr,table.stack th,table.stack td{display:block;width:100%}
  table.stack thead{position:absolute;width:1px;height:1px;overflow:hidden;clip-path:inset(50%)}
  table.stack tr{border-bottom:1px solid ${RULE};padding:.35rem 0}
  table.stack th,table.stack td{border:0;padding:.1rem .3rem;text-align:left;white-space:normal;overflow-wrap:anywhere}
  table.stack tbody th{font-weight:700}
  table.stack td::before{content:attr(data-label) ": ";color:${MUTED};font-size:.8rem}
}
@page{margin:16mm 15mm 18mm}
@media print{
  body{font-size:10pt}
  .page{max-width:none;padding:0}
  nav.contents,.formats,.csv{display:none}
  a{color:inherit;text-decoration:none}
  h2{margin-top:1.2rem}
  thead{display:table-header-group}
  tr,dl.facts div,dl.key div,blockquote.protocol,.citation{break-inside:avoid;page-break-inside:avoid}
  .table-wrap{overflow:visible}
  .chart-wide{display:block}
  .chart-narrow{display:none}
  table{min-width:0;width:100%}
  tbody tr:nth-child(even){background:none}
  section#caution{break-inside:avoid}
}
`;
