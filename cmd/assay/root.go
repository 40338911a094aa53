package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"runtime/debug"
	"strings"

	"github.com/spf13/cobra"
	"golang.org/x/term"
)

// Exit codes.
const (
	exitOK      = 0
	exitFailure = 1
	exitUsage   = 2
)

// App holds what every command shares: the output streams and the version
// string. Tests build one with buffers and a fixed version.
type App struct {
	Out     io.Writer
	Err     io.Writer
	Version string
	// OutTerminal and ErrTerminal say whether the streams are terminals
	// (colour and the progress bar depend on it); Width is the output
	// terminal's width in columns, 0 when unknown.
	OutTerminal, ErrTerminal bool
	Width                    int
	// NoColor is set when the NO_COLOR environment variable is.
	NoColor bool
}

// usageError marks an error in how the command was called (exit code 2).
type usageError struct{ err error }

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

func usagef(format string, args ...any) error {
	return usageError{fmt.Errorf(format, args...)}
}

// Main runs assay with args and returns the exit code.
func Main(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	app := &App{Out: stdout, Err: stderr, Version: buildVersion()}
	if f, ok := stdout.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		app.OutTerminal = true
		if w, _, err := term.GetSize(int(f.Fd())); err == nil {
			app.Width = w
		}
	}
	if f, ok := stderr.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		app.ErrTerminal = true
	}
	_, app.NoColor = os.LookupEnv("NO_COLOR")
	return app.Run(ctx, args)
}

// Run executes the command line args and returns the exit code; the error,
// if any, is printed once to app.Err.
func (app *App) Run(ctx context.Context, args []string) int {
	root := newRootCmd(app)
	root.SetArgs(args)
	err := root.ExecuteContext(ctx)
	if err == nil {
		return exitOK
	}
	fmt.Fprintf(app.Err, "assay: %v\n", err)
	var ue usageError
	// cobra reports an unknown subcommand as a plain error.
	if errors.As(err, &ue) || strings.HasPrefix(err.Error(), "unknown command") {
		fmt.Fprintln(app.Err, "Run 'assay --help' for usage.")
		return exitUsage
	}
	return exitFailure
}

func newRootCmd(app *App) *cobra.Command {
	root := &cobra.Command{
		Use:   "assay",
		Short: "Pick exemplar documents and key terms that stand for a folder of text",
		Long: `assay reads a folder of documents, builds a stemmed TF-IDF document-term
matrix, and picks actual documents (exemplars) and actual terms (key terms)
by CUR-style sampling. It reports how much of the corpus the picks
reconstruct, beside the best any rank-k summary could do.

Sampling supports review; it does not replace the review that law, policy or
a licensed professional requires.

Exit codes: 0 success, 1 failure (for example no readable documents),
2 usage error (unknown flag, bad value, wrong number of arguments).`,
		Version:       app.Version,
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetOut(app.Out)
	root.SetErr(app.Err)
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return usageError{err} })
	root.AddCommand(newPickCmd(app), newDemoCmd(app), newExportCmd(app), newIndexCmd(app))
	return root
}

// buildVersion reports the module version recorded at build time.
func buildVersion() string {
	info, ok := debug.ReadBuildInfo()
	if !ok || info.Main.Version == "" || info.Main.Version == "(devel)" {
		return "devel"
	}
	return info.Main.Version
}
