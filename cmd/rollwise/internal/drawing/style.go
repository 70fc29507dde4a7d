package drawing

// Style is the style sheet of rollwise's HTML pages (the catalog's
// style.css, and inlined in a run's HTML page): plain CSS for the text,
// tables and pictures, with no web fonts or anything fetched.
const Style = `:root { color-scheme: light; }
body { font: 15px/1.45 system-ui, sans-serif; color: #1d232a; background: #fff; margin: 0; }
nav, main, footer { max-width: 72rem; margin: 0 auto; padding: 0.6rem 1.2rem; }
nav { border-bottom: 1px solid #d5dbe1; }
footer { color: #5b6670; font-size: 13px; border-top: 1px solid #d5dbe1; margin-top: 2rem; }
a { color: #1f5fa8; }
h1 { font-size: 1.6rem; margin: 1rem 0 0.4rem; }
h2 { font-size: 1.2rem; margin: 1.4rem 0 0.4rem; }
h3 { font-size: 1rem; margin: 0.8rem 0 0.2rem; }
code, pre { font-family: ui-monospace, monospace; font-size: 13px; }
pre.definition { background: #f4f6f8; border: 1px solid #d5dbe1; padding: 0.6rem; overflow-x: auto; white-space: pre-wrap; }
table { border-collapse: collapse; margin: 0.4rem 0; }
th, td { border-bottom: 1px solid #e1e5ea; padding: 0.25rem 0.7rem; text-align: left; vertical-align: top; }
th { background: #f4f6f8; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
tr.total td { font-weight: 600; background: #eef2f6; }
tr.grand td { border-top: 2px solid #1d232a; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.2rem 1rem; }
dt { color: #5b6670; }
dd { margin: 0; }
.none, .legend { color: #5b6670; }
.doc { font-size: 1.05rem; }
ul.refs { padding-left: 1.2rem; margin: 0.2rem 0; }
.type { color: #5b6670; font-size: 13px; }
.caution { border-left: 4px solid #c77700; background: #fff6e6; padding: 0.4rem 0.8rem; margin: 0.4rem 0; }
.picture { overflow-x: auto; margin: 0.6rem 0; }
svg text { font-family: ui-monospace, monospace; font-size: 12px; fill: #1d232a; }
svg .edge polyline { fill: none; stroke: #7a8794; stroke-width: 1.2; }
svg .edge polygon { fill: #7a8794; }
svg .node .box { fill: #fff; stroke: #5b6670; stroke-width: 1; }
svg .node .head { fill: #e4ebf2; stroke: #5b6670; stroke-width: 1; }
svg .node.measure .box { fill: #eaf2fb; stroke: #1f5fa8; }
svg .node.focus .box { fill: #1f5fa8; }
svg .node.focus text { fill: #fff; }
svg .node.table .name { font-weight: 700; }
svg a:hover .box { stroke-width: 2.5; }
svg .axis line, svg .axis polyline { stroke: #7a8794; fill: none; }
svg .axis line.grid { stroke: #e1e5ea; }
.charts { display: flex; flex-wrap: wrap; gap: 0.5rem 2rem; }
svg .bar { fill: #3b7dd8; }
svg .bar.negative { fill: #c0504d; }
svg .series { fill: none; stroke: #3b7dd8; stroke-width: 2; }
svg .point { fill: #1f5fa8; }
svg .label { fill: #5b6670; }
`
