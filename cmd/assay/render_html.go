package main

import (
	"bufio"
	"fmt"
	"html/template"
	"io"
	"strings"
)

// htmlPage is what the HTML template needs besides the report.
type htmlPage struct {
	R                                *Report
	Spectrum, Curve, Coverage, Sizes template.HTML
	Sampled                          bool
}

// writeHTML writes the report as one self-contained HTML file: inline
// styles, inline SVG charts, no scripts, no fonts or files from elsewhere.
func writeHTML(w io.Writer, rep *Report) error {
	pg := htmlPage{R: rep, Sampled: rep.Options.Method == "norm" || rep.Options.Method == "leverage"}
	var err error
	if pg.Spectrum, err = spectrumChart(rep.Figures.SingularValues, rep.Figures.Rank); err != nil {
		return err
	}
	if len(rep.Curve) > 0 {
		if pg.Curve, err = curveChart(rep.Curve); err != nil {
			return err
		}
	}
	if pg.Coverage, err = histogramChart(rep.Figures.Coverage.Histogram); err != nil {
		return err
	}
	if pg.Sizes, err = groupChart(rep.Exemplars); err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	if err := htmlTemplate.Execute(bw, pg); err != nil {
		return fmt.Errorf("write html: %w", err)
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("write html: %w", err)
	}
	return nil
}

var htmlTemplate = template.Must(template.New("report").Funcs(template.FuncMap{
	"pct":   func(n num) string { return percent(float64(n)) },
	"f4":    func(n num) string { return fmt.Sprintf("%.4f", float64(n)) },
	"f3p":   func(n *num) string { return fmt.Sprintf("%.3f", float64(*n)) },
	"join":  func(s []string) string { return strings.Join(s, ", ") },
	"inc":   func(i int) int { return i + 1 },
	"label": methodLabel,
}).Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>assay · {{.R.Input.Source}}</title>
<style>
body { font-family: system-ui, sans-serif; max-width: 62rem; margin: 1.5rem auto; padding: 0 1rem; color: #1b1b1b; line-height: 1.45; }
h1 { font-size: 1.5rem; margin-bottom: .2rem; }
h2 { font-size: 1.2rem; border-bottom: 1px solid #ccc; padding-bottom: .2rem; margin-top: 2rem; }
h3 { font-size: 1rem; margin: 1.2rem 0 .3rem; }
.caution { background: #fff6e0; border-left: 4px solid #b05a00; padding: .5rem .8rem; }
.headline { font-size: 1.1rem; }
table { border-collapse: collapse; width: 100%; font-size: .9rem; margin: .5rem 0; }
th, td { text-align: left; padding: .25rem .5rem; border-bottom: 1px solid #e4e4e4; vertical-align: top; }
th { background: #f3f5f8; }
td.n { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
code { font-size: .85rem; word-break: break-all; }
.group { margin-left: 1rem; font-size: .9rem; }
.charts { display: grid; grid-template-columns: repeat(auto-fit, minmax(28rem, 1fr)); gap: 1rem; }
.charts svg { width: 100%; height: auto; }
@media print { body { max-width: none; } .charts { grid-template-columns: 1fr 1fr; } h2 { break-after: avoid; } section { break-inside: avoid-page; } }
</style>
</head>
<body>
<header>
<h1>Exemplar documents and key terms</h1>
<p>{{.R.Input.Source}} · assay {{.R.Tool.Version}}</p>
</header>
<p class="caution">{{.R.Caution}}</p>

<section id="summary">
<h2>Summary</h2>
{{with .R.Figures.Documents}}<p class="headline">These {{.Count}} documents span <strong>{{pct .Captured}}</strong> of the corpus; the best any {{.Count}}-dimensional summary could span is {{pct .BestCaptured}}{{if .Eta}} (η<sub>docs</sub> = {{f3p .Eta}}){{end}}.</p>{{end}}
<ul>
<li>{{.R.Input.DocumentsRead}} documents read, {{.R.Input.DocumentsUsed}} used ({{.R.Input.Distinct}} distinct), {{.R.Input.FilesSkipped}} skipped (files or parts of them)</li>
<li>{{.R.Input.TermsKept}} of {{.R.Input.Vocabulary}} terms kept</li>
<li>Coverage of the documents by the exemplars: mean {{pct .R.Figures.Coverage.Mean}}, median {{pct .R.Figures.Coverage.Median}}</li>
<li>Documents and terms together (C·U·R): {{pct .R.Figures.Joint.Captured}} captured; the best rank-{{.R.Figures.Rank}} approximation {{pct .R.Figures.Joint.BestCaptured}}{{if .R.Figures.Joint.Eta}} (η = {{f3p .R.Figures.Joint.Eta}}){{end}}</li>
</ul>
<div class="charts">
<figure>{{.Spectrum}}</figure>
{{if .Curve}}<figure>{{.Curve}}</figure>{{end}}
<figure>{{.Coverage}}</figure>
<figure>{{.Sizes}}</figure>
</div>
</section>

<section id="exemplars">
<h2>Exemplars and their groups</h2>
{{range $i, $e := .R.Exemplars}}
<h3>{{inc $i}}. {{$e.Title}}</h3>
<div class="group">
<p><code>{{$e.ID}}</code> · stands for {{$e.Group.Size}} documents ({{pct $e.Group.Share}} of the corpus){{if $.Sampled}} · drawn {{$e.Picks}}×, weight {{f4 $e.Weight}}{{else}} · score {{f4 $e.Score}}{{end}}</p>
<p>Key terms: {{join $e.Group.KeyTerms}}</p>
{{if $e.Group.Members}}<p>Also in the group: {{range $k, $m := $e.Group.Members}}{{if $k}}, {{end}}<code>{{$m}}</code>{{end}}</p>{{end}}
{{if $e.Duplicates}}<p>Same text: {{range $k, $m := $e.Duplicates}}{{if $k}}, {{end}}<code>{{$m}}</code>{{end}}</p>{{end}}
{{if $e.NearCopies}}<p>Near-copies ({{len $e.NearCopies}}): {{range $k, $m := $e.NearCopies}}{{if $k}}, {{end}}<code>{{$m}}</code>{{end}}</p>{{end}}
</div>
{{end}}
</section>

<section id="terms">
<h2>Key terms</h2>
<table>
<tr><th>#</th><th>term</th><th>stem</th><th>documents</th><th>coverage</th></tr>
{{range $i, $t := .R.Terms}}<tr><td class="n">{{inc $i}}</td><td>{{$t.Term}}</td><td>{{$t.Stem}}</td><td class="n">{{$t.DF}}</td><td class="n">{{pct $t.Coverage}}</td></tr>
{{end}}</table>
</section>

<section id="missed">
<h2>Read these too</h2>
<p>The documents the exemplars cover least.</p>
<table>
<tr><th>coverage</th><th>document</th><th>title</th><th>top terms</th></tr>
{{range .R.Missed}}<tr><td class="n">{{pct .Coverage}}</td><td><code>{{.ID}}</code></td><td>{{.Title}}</td><td>{{join .TopTerms}}</td></tr>
{{end}}</table>
</section>

<section id="curve">
<h2>How many to read</h2>
<table>
<tr><th>documents</th><th>span</th><th>best possible</th></tr>
{{range .R.Curve}}<tr><td class="n">{{.Docs}}</td><td class="n">{{pct .Captured}}</td><td class="n">{{pct .BestCaptured}}</td></tr>
{{end}}</table>
</section>

<section id="skipped">
<h2>Skipped files</h2>
{{if .R.Skipped}}<table>
<tr><th>file</th><th>reason</th></tr>
{{range .R.Skipped}}<tr><td><code>{{.Path}}</code></td><td>{{.Reason}}</td></tr>
{{end}}</table>{{else}}<p>None.</p>{{end}}
</section>

<section id="run">
<h2>Run record</h2>
<ul>
<li>Method: {{label .R.Options.Method}}; core {{.R.Options.Core}}; seed {{.R.Options.Seed}}; rank k = {{.R.Figures.Rank}}; groups by {{.R.Options.GroupBy}}</li>
<li>Reference SVD: {{.R.Figures.SVD}}</li>
<li>Input fingerprint: <code>{{.R.Input.Fingerprint}}</code></li>
<li>Tool: assay {{.R.Tool.Version}} (report schema {{.R.Schema}})</li>
{{with .R.Timings}}<li>Timings: read {{f4 .Read}} s, reference SVD {{f4 .SVD}} s, select {{f4 .Select}} s, measure {{f4 .Measure}} s</li>{{end}}
<li>To repeat: <code>{{.R.Repeat}}</code></li>
{{range .R.Warnings}}<li>Warning: {{.}}</li>{{end}}
</ul>
</section>
</body>
</html>
`))
