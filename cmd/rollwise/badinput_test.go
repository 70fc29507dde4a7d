package main

import (
	"bufio"
	"bytes"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// badInputDir holds the bad-input corpus: hostile and broken model files
// (random bytes, NUL bytes and invalid UTF-8 in quotes, unterminated
// quotes, deep nesting, 100,000-character names, cycles, name clashes,
// injection attempts on the command line) with, in cases.txt, the command
// to run on each, its exit code and a text its stderr must hold.
const badInputDir = "../../testdata/badinput"

// badCase is one line of cases.txt.
type badCase struct {
	file string
	args []string
	code int
	want string
}

func readBadCases(t *testing.T) []badCase {
	t.Helper()
	f, err := os.Open(filepath.Join(badInputDir, "cases.txt"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var out []badCase
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		parts := strings.SplitN(line, " | ", 4)
		if len(parts) != 4 {
			t.Fatalf("cases.txt: %q has not 4 fields", line)
		}
		code, err := strconv.Atoi(parts[2])
		if err != nil {
			t.Fatalf("cases.txt: %q: %v", line, err)
		}
		out = append(out, badCase{file: parts[0], args: shellWords(t, parts[1]), code: code, want: parts[3]})
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return out
}

// shellWords splits a command line at blanks outside single and double
// quotes, as a POSIX shell would for these simple lines.
func shellWords(t *testing.T, s string) []string {
	t.Helper()
	var words []string
	var cur strings.Builder
	inWord := false
	var quote byte
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case quote != 0 && c == quote:
			quote = 0
		case quote != 0:
			cur.WriteByte(c)
		case c == '\'' || c == '"':
			quote, inWord = c, true
		case c == ' ':
			if inWord {
				words = append(words, cur.String())
				cur.Reset()
				inWord = false
			}
		default:
			cur.WriteByte(c)
			inWord = true
		}
	}
	if quote != 0 {
		t.Fatalf("unclosed quote in %q", s)
	}
	if inWord {
		words = append(words, cur.String())
	}
	return words
}

// TestBadInputCorpus runs every case of the corpus through Main: the exit
// code and the message are the expected ones, nothing panics (Main would
// turn a panic into exit 3 with "internal error"), no Go stack trace
// reaches stderr, and the output stays bounded. It reports the counts
// that docs/testing.md quotes.
func TestBadInputCorpus(t *testing.T) {
	t.Parallel()
	cases := readBadCases(t)
	clean := 0
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			args := append([]string(nil), c.args...)
			for i, a := range args {
				if a == "MODEL" {
					args[i] = filepath.Join(badInputDir, "models", c.file)
				}
			}
			out := filepath.Join(t.TempDir(), "out")
			for i, a := range args {
				if a == "--out" && i+1 < len(args) && args[i+1] != "" {
					args[i+1] = out
				}
			}
			var stdout, stderr bytes.Buffer
			code := Main(args, nil, &stdout, &stderr)
			e := stderr.String()
			ok := true
			if code != c.code {
				t.Errorf("exit %d, want %d", code, c.code)
				ok = false
			}
			if !strings.Contains(e, c.want) {
				t.Errorf("stderr does not hold %q:\n%.2000s", c.want, e)
				ok = false
			}
			for _, bad := range []string{"panic", "goroutine ", "internal error", ".go:"} {
				if strings.Contains(e, bad) {
					t.Errorf("stderr holds %q:\n%.2000s", bad, e)
					ok = false
				}
			}
			if len(e) > 256<<10 {
				t.Errorf("%d bytes of stderr", len(e))
				ok = false
			}
			if ok {
				clean++
			}
		})
	}
	t.Logf("bad-input corpus: %d inputs tried, %d clean errors or successes as expected, %d not", len(cases), clean, len(cases)-clean)
}
