package main

import (
	"os"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/views"
)

// maxFileName is the longest file name, in bytes, that the usual file
// systems take: NAME_MAX is 255 on Linux (ext4, XFS, Btrfs), and APFS
// and NTFS allow 255 characters.
const maxFileName = 255

// viewsFolderArgs refuses --out and --check values that cannot name the
// folder: an empty one (which would otherwise mean "print to stdout"),
// and a --check path that is a file.
func viewsFolderArgs(cmd *cobra.Command, o *viewsOptions) error {
	for _, f := range []struct{ name, value string }{{"out", o.out}, {"check", o.check}} {
		if cmd.Flags().Changed(f.name) && f.value == "" {
			return failure.Usagef("--%s needs a folder name, not an empty one", f.name)
		}
	}
	if o.check != "" {
		if fi, err := os.Stat(o.check); err == nil && !fi.IsDir() {
			return failure.Usagef("--check %s: that is a file; --check compares a folder written by --out", o.check)
		}
	}
	return nil
}

// viewFileNames refuses a set whose file names some file systems cannot
// hold, before anything is written.
func viewFileNames(set *views.Set) error {
	for _, v := range set.Views {
		if len(v.File) > maxFileName {
			return failure.Newf(failure.Findings, "view %.40s...: its file name is %d bytes, and file systems take at most %d; give the view a shorter name",
				v.Name, len(v.File), maxFileName)
		}
	}
	return nil
}
