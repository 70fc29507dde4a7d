package catalog

import "html/template"

// pages are the catalog's page templates. html/template escapes every
// name, description and definition, so a model's text can never become
// markup; the pictures are built by the drawing package, which escapes
// its text itself.
var pages = template.Must(template.New("").Parse(`
{{define "head"}}<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>{{.Title}} · rollwise catalog</title>
<link rel="stylesheet" href="style.css">
</head>
<body>
<nav><a href="index.html">Model catalog</a></nav>
<main>
{{end}}

{{define "foot"}}</main>
<footer>Written by <code>rollwise docs</code>.</footer>
</body>
</html>
{{end}}

{{define "refs"}}{{if .}}<ul class="refs">{{range .}}<li><a href="{{.Href}}">{{.Name}}</a></li>{{end}}</ul>{{else}}<p class="none">none</p>{{end}}{{end}}

{{define "index"}}{{template "head" .}}<h1>Model catalog</h1>
<p>From {{range $i, $f := .Files}}{{if $i}}, {{end}}<code>{{$f}}</code>{{end}}.</p>
<h2 id="measures">Measures</h2>
{{if .Measures}}<table>
<thead><tr><th>measure</th><th>format</th><th>description</th></tr></thead>
<tbody>
{{range .Measures}}<tr><td><a href="{{.Href}}">{{.Name}}</a></td><td>{{.Format}}</td><td>{{.Doc}}</td></tr>
{{end}}</tbody>
</table>{{else}}<p class="none">The model has no measures.</p>{{end}}
<h2 id="tables">Tables</h2>
<table>
<thead><tr><th>table</th><th>relation</th><th>columns</th><th>links</th></tr></thead>
<tbody>
{{range .Tables}}<tr><td><a href="{{.Href}}">{{.Name}}</a></td><td><code>{{.Relation}}</code></td><td class="num">{{.Columns}}</td><td class="num">{{.LinkOut}}</td></tr>
{{end}}</tbody>
</table>
<p class="legend">An arrow leads from a table to the table its link points at; <code>#</code> marks the key columns.</p>
<div class="picture">{{.Diagram}}</div>
{{if .Views}}<h2 id="views">Views</h2>
<table>
<thead><tr><th>view</th><th>measures</th><th>by</th><th>totals</th></tr></thead>
<tbody>
{{range .Views}}<tr><td>{{.Name}}</td><td>{{range $i, $m := .Measures}}{{if $i}}, {{end}}<a href="{{$m.Href}}">{{$m.Name}}</a>{{end}}</td><td>{{range $i, $c := .By}}{{if $i}}, {{end}}<code>{{$c}}</code>{{end}}</td><td>{{.Totals}}</td></tr>
{{end}}</tbody>
</table>{{end}}
{{template "foot" .}}{{end}}

{{define "measure"}}{{template "head" .}}<h1>measure {{.Title}}</h1>
{{if .Doc}}<p class="doc">{{.Doc}}</p>{{else}}<p class="none">No description.</p>{{end}}
<dl>
<dt>format</dt><dd>{{.Format}}</dd>
<dt>type</dt><dd>{{.Type}}</dd>
<dt>declared at</dt><dd><code>{{.Where}}</code></dd>
{{if .Views}}<dt>in views</dt><dd>{{range $i, $v := .Views}}{{if $i}}, {{end}}{{$v}}{{end}}</dd>{{end}}
</dl>
<h2>Definition</h2>
<pre class="definition">{{.Definition}}</pre>
<h2>Reads</h2>
<h3>tables</h3>
{{if .Tables}}{{template "refs" .Tables}}{{else}}<p class="none">none of its own: it reads through the measures it builds on</p>{{end}}
<h3>columns</h3>
{{if .Columns}}<ul class="refs">{{range .Columns}}<li><a href="{{.Href}}">{{.Name}}</a> <span class="type">{{.Type}}</span></li>{{end}}</ul>{{else}}<p class="none">none of its own</p>{{end}}
<h2>Builds on</h2>
{{template "refs" .Uses}}
<h2>Built on it</h2>
{{template "refs" .UsedBy}}
<h2>Dependencies</h2>
<p class="legend">An arrow leads from a measure to what it builds on: measures, and the tables it reads.</p>
<div class="picture">{{.Graph}}</div>
{{template "foot" .}}{{end}}

{{define "table"}}{{template "head" .}}<h1>table {{.Title}}</h1>
<dl>
<dt>relation</dt><dd><code>{{.Relation}}</code></dd>
{{if .File}}<dt>data file</dt><dd><code>{{.File}}</code></dd>{{end}}
{{if .NullTexts}}<dt>texts read as NULL</dt><dd>{{range $i, $t := .NullTexts}}{{if $i}}, {{end}}<code>{{$t}}</code>{{end}}</dd>{{end}}
<dt>key</dt><dd>{{if .Key}}{{range $i, $k := .Key}}{{if $i}}, {{end}}<code>{{$k}}</code>{{end}}{{else}}none{{end}}</dd>
<dt>declared at</dt><dd><code>{{.Where}}</code></dd>
</dl>
<h2>Columns</h2>
<table>
<thead><tr><th>column</th><th>type</th><th>key</th><th>source</th><th>class</th><th>link</th></tr></thead>
<tbody>
{{range .Columns}}<tr id="col-{{.Name}}"><td>{{.Name}}</td><td>{{.Type}}</td><td>{{if .Key}}key{{end}}</td><td><code>{{.Source}}</code></td><td>{{.Additivity}}</td><td>{{with .Link}}<a href="{{.Href}}">{{.Name}}</a>{{end}}</td></tr>
{{end}}</tbody>
</table>
<h2>Links</h2>
<h3>from this table</h3>
{{if .LinksOut}}<ul>{{range .LinksOut}}<li><code>{{.Text}}</code> to <a href="{{.Other.Href}}">{{.Other.Name}}</a>{{if .Required}} (required){{end}}</li>{{end}}</ul>{{else}}<p class="none">none</p>{{end}}
<h3>to this table</h3>
{{if .LinksIn}}<ul>{{range .LinksIn}}<li><code>{{.Text}}</code> from <a href="{{.Other.Href}}">{{.Other.Name}}</a>{{if .Required}} (required){{end}}</li>{{end}}</ul>{{else}}<p class="none">none</p>{{end}}
<div class="picture">{{.Diagram}}</div>
<h2>Measures that read it</h2>
{{template "refs" .Readers}}
{{template "foot" .}}{{end}}
`))
