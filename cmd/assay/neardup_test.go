package main

import (
	"context"
	"fmt"
	"os"
	"strings"
	"testing"

	selection "assay/select"
	"assay/sparsemat"
)

// An invented base report and its planted near-copies, plus distinct
// notices that share a long footer.
const (
	nearBase = "Inspection of the Greyfold weir\n\n" +
		"The weir gates were opened at dawn and the sluice channel was cleared of reeds and silt. " +
		"Two stop logs had cracked in the frost and were replaced from the depot at Brannock Ford.\n\n" +
		"The downstream apron shows scour along the eastern wall; divers will survey it in April. " +
		"Gauge readings rose by forty centimetres after the thaw and fell back within two days.\n\n" +
		"Volunteers counted eleven herons on the island and an otter spraint near the fish pass. " +
		"The access track needs gravel before the spring fencing contract starts."
	footer = "\n\nThis message and any attachment are confidential and intended only for the named recipient. " +
		"If you have received it in error, please tell the sender and delete it. The authority accepts no " +
		"liability for changes made after it was sent. Registered office: Lantern Row, Ostravel."
)

func nearFixture() map[string]string {
	paras := strings.Split(nearBase, "\n\n")
	files := map[string]string{
		"reports/weir-inspection.txt":           nearBase,
		"reports/weir-inspection-edited.txt":    strings.NewReplacer("eleven", "twelve", "April", "May", "forty", "fifty").Replace(nearBase),
		"reports/weir-inspection-reordered.txt": strings.Join([]string{paras[0], paras[3], paras[1], paras[2]}, "\n\n"),
		"mail/reply-about-weir.txt": "Re: Inspection of the Greyfold weir\n\nThanks, agreed on the gravel.\n\n> " +
			strings.ReplaceAll(nearBase, "\n", "\n> "),
		"notices/car-park.txt":    "Car park closure\n\nThe staff car park on Lantern Row closes on Friday for resurfacing; please use the market square." + footer,
		"notices/fire-drill.txt":  "Fire drill\n\nA fire drill will take place on Tuesday at ten; leave by the nearest exit and gather by the clock tower." + footer,
		"notices/payroll.txt":     "Payroll date\n\nSalaries for March will be paid on the twenty-sixth because of the bank holiday weekend." + footer,
		"notices/new-printer.txt": "New printer\n\nThe second-floor printer has been replaced; the old toner cartridges go back to the supplier." + footer,
	}
	for i, topic := range []string{"otters", "ferries", "grants", "libraries", "fires", "buses"} {
		files[fmt.Sprintf("other/%s.txt", topic)] = fmt.Sprintf("Notes on %s\n\nThe %s report for the valley lists the gauge, the weir, the depot and the island, "+
			"with spring counts and a plan for the access track and the fencing contract, item %d.", topic, topic, i)
	}
	return files
}

// cosines returns, for a folder and the pick options, a function giving the
// cosine of two documents' weighted rows (as the picking sees them).
func cosines(t *testing.T, dir string, opts pickOptions) func(a, b string) float64 {
	t.Helper()
	fsys, err := openFolder(dir)
	if err != nil {
		t.Fatal(err)
	}
	an, err := analyze(context.Background(), fsys, opts)
	if err != nil {
		t.Fatal(err)
	}
	a := sparsemat.Weight(an.counts, opts.Weight)
	row := map[string]int{}
	for r, d := range an.counts.Rows {
		row[an.docs[d].ID] = r
	}
	return func(x, y string) float64 {
		c, _, _ := selection.MaxPairCosine(a, []int{row[x], row[y]})
		return c
	}
}

// Planted near-copies — small edits, reordered paragraphs, a reply that
// quotes the whole report — are merged under one exemplar; notices that
// only share a long legal footer are not; and no two exemplars are near-
// copies (cosine ≥ 0.9) of each other.
func TestNearCopiesFound(t *testing.T) {
	dir := writeTree(t, nearFixture())
	r := runJSONReport(t, "pick", dir, "--docs", "8", "--terms", "10")
	var weir *exemplarOut
	for i, e := range r.Exemplars {
		if strings.HasPrefix(e.ID, "reports/weir-inspection") || e.ID == "mail/reply-about-weir.txt" {
			if weir != nil {
				t.Errorf("two exemplars from the weir report: %s and %s", weir.ID, e.ID)
			}
			weir = &r.Exemplars[i]
		}
		for _, nc := range e.NearCopies {
			if strings.HasPrefix(nc, "notices/") {
				t.Errorf("%s lists %s as a near-copy: a shared footer is not a copy", e.ID, nc)
			}
		}
	}
	if weir == nil {
		t.Fatal("the weir report is not among the exemplars")
	}
	got := strings.Join(append([]string{weir.ID}, weir.NearCopies...), " ")
	for _, id := range []string{"reports/weir-inspection.txt", "reports/weir-inspection-edited.txt", "reports/weir-inspection-reordered.txt", "mail/reply-about-weir.txt"} {
		if !strings.Contains(got, id) {
			t.Errorf("%s is not with the weir report's exemplar (%s)", id, got)
		}
	}
	f := defaultFlags(t)
	opts, _ := f.options(dir)
	cos := cosines(t, dir, opts)
	for i := range r.Exemplars {
		for j := i + 1; j < len(r.Exemplars); j++ {
			if c := cos(r.Exemplars[i].ID, r.Exemplars[j].ID); c >= 0.9 {
				t.Errorf("exemplars %s and %s have cosine %.3f ≥ 0.9", r.Exemplars[i].ID, r.Exemplars[j].ID, c)
			}
		}
	}
	// With --near-dup off the copies are not merged.
	off := runJSONReport(t, "pick", dir, "--docs", "8", "--terms", "10", "--near-dup", "off")
	for _, e := range off.Exemplars {
		if len(e.NearCopies) > 0 {
			t.Errorf("--near-dup off: %s lists near-copies", e.ID)
		}
	}
}

// On the SpamAssassin messages (ASSAY_SPAMASSASSIN_EML, see
// TestSpamAssassinPicks), no two of 30 picks are near-copies.
func TestSpamAssassinNoNearCopies(t *testing.T) {
	dir := os.Getenv("ASSAY_SPAMASSASSIN_EML")
	if dir == "" {
		t.Skip("set ASSAY_SPAMASSASSIN_EML (bench/fetch-corpora.sh)")
	}
	r := runJSONReport(t, "pick", dir, "--docs", "30", "--curve-max", "30")
	f := defaultFlags(t)
	opts, _ := f.options(dir)
	cos := cosines(t, dir, opts)
	worst := 0.0
	merged := 0
	for i := range r.Exemplars {
		merged += len(r.Exemplars[i].NearCopies)
		for j := i + 1; j < len(r.Exemplars); j++ {
			c := cos(r.Exemplars[i].ID, r.Exemplars[j].ID)
			worst = max(worst, c)
			if c >= 0.9 {
				t.Errorf("exemplars %s and %s have cosine %.3f", r.Exemplars[i].ID, r.Exemplars[j].ID, c)
			}
		}
	}
	t.Logf("largest cosine between two of 30 exemplars: %.3f; near-copies listed under them: %d", worst, merged)
}
