package main

import (
	"sort"
	"strings"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
)

// addCompletions teaches the shell completion of `rollwise completion`
// what cmd's arguments and flags name: model files (.roll) as arguments,
// and, read from the model files already on the line, measures for -m,
// columns (table.column) for -b and, with an =, for explain's --cell,
// views for --view; dialects for -d and
// the totals modes for --totals.
func addCompletions(cmd *cobra.Command) {
	cmd.ValidArgsFunction = func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return []string{"roll"}, cobra.ShellCompDirectiveFilterFileExt
	}
	fromModel := func(flag string, names func(*model.Model) []string) {
		if cmd.Flags().Lookup(flag) == nil {
			return
		}
		_ = cmd.RegisterFlagCompletionFunc(flag, func(_ *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
			m := quietModel(args)
			if m == nil {
				return nil, cobra.ShellCompDirectiveNoFileComp
			}
			return completeListItem(names(m), toComplete), cobra.ShellCompDirectiveNoFileComp | cobra.ShellCompDirectiveNoSpace
		})
	}
	fromModel("measures", func(m *model.Model) []string {
		var out []string
		for _, x := range m.Measures {
			out = append(out, x.Name)
		}
		return out
	})
	columns := func(m *model.Model) []string {
		var out []string
		for _, t := range m.Tables {
			for _, c := range t.Columns {
				out = append(out, c.String())
			}
		}
		return out
	}
	fromModel("by", columns)
	// explain's --cell: a column followed by =, its value for the user.
	fromModel("cell", func(m *model.Model) []string {
		out := columns(m)
		for i := range out {
			out[i] += "="
		}
		return out
	})
	fromModel("view", func(m *model.Model) []string {
		var out []string
		for _, v := range m.Views {
			out = append(out, v.Name)
		}
		return out
	})
	fixed := func(flag string, values []string) {
		if cmd.Flags().Lookup(flag) != nil {
			_ = cmd.RegisterFlagCompletionFunc(flag, func(_ *cobra.Command, _ []string, toComplete string) ([]string, cobra.ShellCompDirective) {
				return completeListItem(values, toComplete), cobra.ShellCompDirectiveNoFileComp
			})
		}
	}
	fixed("dialect", dialects.Names())
	fixed("totals", []string{"none", "grand", "rollup", "all"})
}

// completeListItem completes the last item of a comma-separated list:
// "revenue,mar" gives "revenue,margin", "revenue,margin_rate".
func completeListItem(names []string, toComplete string) []string {
	done, last := "", toComplete
	if i := strings.LastIndexByte(toComplete, ','); i >= 0 {
		done, last = toComplete[:i+1], toComplete[i+1:]
	}
	var out []string
	for _, n := range names {
		if strings.HasPrefix(n, last) {
			out = append(out, done+n)
		}
	}
	sort.Strings(out)
	return out
}

// quietModel reads the model files (or folders of them) among args for
// completion, printing nothing: whatever resolves is offered, nil when
// nothing can be read.
func quietModel(args []string) *model.Model {
	var files []pipeline.Source
	for _, p := range args {
		for _, name := range pipeline.FileNames(p) {
			if f, err := pipeline.Read([]string{name}); err == nil {
				files = append(files, f...)
			}
		}
	}
	if len(files) == 0 {
		return nil
	}
	m, _ := pipeline.Resolve(files)
	return m
}
