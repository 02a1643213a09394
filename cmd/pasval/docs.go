package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"
	"github.com/spf13/cobra/doc"

	"pasval/internal/fileout"
)

type docsOptions struct {
	dir   string
	force bool
}

func newDocsCmd(stdout io.Writer) *cobra.Command {
	var opts docsOptions
	cmd := &cobra.Command{
		Use:   "docs DIR",
		Short: "Write a man page for every command into DIR",
		Long: `docs writes one man page (section 1) per command, pasval.1, pasval-check.1
and so on, into DIR, which must exist. Pages are written atomically and an
existing page is kept unless --force. The page date is today, or
SOURCE_DATE_EPOCH when set (reproducible builds).` + "\n" + exitStatusHelp,
		Example: `  mkdir -p man && pasval docs man && man -l man/pasval-check.1`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) != 1 {
				return usagef("docs needs exactly one folder, got %d arguments", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.dir = args[0]
			return runDocs(cmd.Root(), opts, stdout)
		},
	}
	cmd.Flags().BoolVar(&opts.force, "force", false, "overwrite existing pages")
	return cmd
}

// docsDate is SOURCE_DATE_EPOCH when set, else today.
func docsDate() time.Time {
	if s := os.Getenv("SOURCE_DATE_EPOCH"); s != "" {
		if n, err := strconv.ParseInt(s, 10, 64); err == nil {
			return time.Unix(n, 0).UTC()
		}
	}
	return time.Now().UTC()
}

// ManPageName is the file a command's page goes to: "pasval check" → pasval-check.1.
func manPageName(c *cobra.Command) string {
	return strings.ReplaceAll(c.CommandPath(), " ", "-") + ".1"
}

// manPage is one rendered page and the file it goes to.
type manPage struct {
	path string
	text []byte
}

func runDocs(root *cobra.Command, opts docsOptions, out io.Writer) error {
	if st, err := os.Stat(opts.dir); err != nil || !st.IsDir() {
		return usagef("%s is not a folder (create it first)", opts.dir)
	}
	date := docsDate()
	header := &doc.GenManHeader{Title: "PASVAL", Section: "1", Source: "pasval", Manual: "pasval manual", Date: &date}
	var cmds []*cobra.Command
	var walk func(c *cobra.Command)
	walk = func(c *cobra.Command) {
		if !c.IsAvailableCommand() && c != root || c.IsAdditionalHelpTopicCommand() {
			return
		}
		cmds = append(cmds, c)
		for _, s := range c.Commands() {
			walk(s)
		}
	}
	walk(root)
	// Render every page, then check every target, before writing any: a
	// refusal (a page without --force, a folder or pipe where a page goes)
	// leaves the folder as it was, never a mixed set.
	root.DisableAutoGenTag = true
	pages := make([]manPage, 0, len(cmds))
	for _, c := range cmds {
		c.DisableAutoGenTag = true
		var buf bytes.Buffer
		if err := doc.GenMan(c, header, &buf); err != nil {
			return err
		}
		pages = append(pages, manPage{path: filepath.Join(opts.dir, manPageName(c)), text: buf.Bytes()})
	}
	for _, p := range pages {
		if err := fileout.Check(p.path, opts.force); err != nil {
			if errors.Is(err, fileout.ErrExists) {
				return usagef("%s already exists; use --force to overwrite the pages", p.path)
			}
			return usagef("%v; no page was written", err)
		}
	}
	for _, p := range pages {
		if err := fileout.Write(p.path, p.text, opts.force); err != nil {
			return usagef("%v", err)
		}
	}
	fmt.Fprintf(out, "wrote %d man pages to %s\n", len(cmds), opts.dir)
	return nil
}
