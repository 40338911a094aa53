// Command assay picks exemplar documents and key terms that stand for a
// folder of text, and says how much of the folder they account for.
//
// See the README for usage; `assay --help` lists the commands.
package main

import (
	"context"
	"os"
	"os/signal"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	code := Main(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}
