// Package langserver is rollwise's language server: for any editor that
// speaks the Language Server Protocol over standard input and output, it
// gives the diagnostics of `rollwise check` as a model is typed (the same
// messages, positions and hints), hover, go to definition and find
// references for measures, tables and columns, completion of measure
// names and of table.column after a dot, and formatting when a formatter
// is given.
//
// The protocol's message types and method dispatch come from
// github.com/tliron/glsp; the JSON-RPC framing from
// github.com/sourcegraph/jsonrpc2.
package langserver

import (
	"context"
	"io"
	"net/url"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"

	"github.com/sourcegraph/jsonrpc2"
	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"
)

// Formatter formats one model file's text, as `rollwise fmt` does.
type Formatter func(name, src string) (string, error)

// Server holds the documents an editor has open.
type Server struct {
	mu      sync.Mutex
	docs    map[string]string // path -> text of the open documents
	handler protocol.Handler
	format  Formatter
	conn    *jsonrpc2.Conn
}

// Serve answers the client on in and out until it sends exit or closes
// the stream. format may be nil: then the server offers no formatting.
func Serve(ctx context.Context, in io.Reader, out io.Writer, format Formatter) error {
	s := &Server{docs: map[string]string{}, format: format}
	s.handler = protocol.Handler{
		Initialize:             s.initialize,
		Initialized:            func(*glsp.Context, *protocol.InitializedParams) error { return nil },
		Shutdown:               func(*glsp.Context) error { return nil },
		SetTrace:               func(*glsp.Context, *protocol.SetTraceParams) error { return nil },
		TextDocumentDidOpen:    s.didOpen,
		TextDocumentDidChange:  s.didChange,
		TextDocumentDidClose:   s.didClose,
		TextDocumentHover:      s.hover,
		TextDocumentDefinition: s.definition,
		TextDocumentReferences: s.references,
		TextDocumentCompletion: s.completion,
	}
	if format != nil {
		s.handler.TextDocumentFormatting = s.formatting
	}
	stream := jsonrpc2.NewBufferedStream(pipe{in, out}, jsonrpc2.VSCodeObjectCodec{})
	s.conn = jsonrpc2.NewConn(ctx, stream, jsonrpc2.HandlerWithError(s.handle))
	select {
	case <-s.conn.DisconnectNotify():
	case <-ctx.Done():
		s.conn.Close()
	}
	return nil
}

// pipe joins the two halves of standard input and output into one stream.
type pipe struct {
	io.Reader
	io.Writer
}

func (pipe) Close() error { return nil }

// handle dispatches one request or notification to the handler.
func (s *Server) handle(ctx context.Context, conn *jsonrpc2.Conn, req *jsonrpc2.Request) (any, error) {
	gc := &glsp.Context{
		Method: req.Method,
		Notify: func(method string, params any) { _ = conn.Notify(ctx, method, params) },
		Call:   func(method string, params, result any) { _ = conn.Call(ctx, method, params, result) },
	}
	if req.Params != nil {
		gc.Params = *req.Params
	}
	if req.Method == "exit" {
		return nil, conn.Close()
	}
	r, validMethod, validParams, err := s.handler.Handle(gc)
	switch {
	case !validMethod:
		if req.Notif {
			return nil, nil // notifications we do not know are ignored
		}
		return nil, &jsonrpc2.Error{Code: jsonrpc2.CodeMethodNotFound, Message: "rollwise does not support " + req.Method}
	case !validParams:
		msg := "bad parameters"
		if err != nil {
			msg = err.Error()
		}
		return nil, &jsonrpc2.Error{Code: jsonrpc2.CodeInvalidParams, Message: msg}
	case err != nil:
		return nil, &jsonrpc2.Error{Code: jsonrpc2.CodeInternalError, Message: err.Error()}
	}
	return r, nil
}

func (s *Server) initialize(*glsp.Context, *protocol.InitializeParams) (any, error) {
	caps := s.handler.CreateServerCapabilities()
	full := protocol.TextDocumentSyncKindFull
	caps.TextDocumentSync = &protocol.TextDocumentSyncOptions{OpenClose: &protocol.True, Change: &full}
	caps.CompletionProvider = &protocol.CompletionOptions{TriggerCharacters: []string{"."}}
	name := "rollwise"
	return protocol.InitializeResult{Capabilities: caps, ServerInfo: &protocol.InitializeResultServerInfo{Name: name}}, nil
}

func (s *Server) didOpen(gc *glsp.Context, p *protocol.DidOpenTextDocumentParams) error {
	s.setDoc(gc, p.TextDocument.URI, p.TextDocument.Text)
	return nil
}

func (s *Server) didChange(gc *glsp.Context, p *protocol.DidChangeTextDocumentParams) error {
	for _, c := range p.ContentChanges {
		if whole, ok := c.(protocol.TextDocumentContentChangeEventWhole); ok {
			s.setDoc(gc, p.TextDocument.URI, whole.Text)
		}
	}
	return nil
}

func (s *Server) didClose(gc *glsp.Context, p *protocol.DidCloseTextDocumentParams) error {
	path := uriPath(p.TextDocument.URI)
	s.mu.Lock()
	delete(s.docs, path)
	s.mu.Unlock()
	gc.Notify(protocol.ServerTextDocumentPublishDiagnostics, protocol.PublishDiagnosticsParams{URI: p.TextDocument.URI, Diagnostics: []protocol.Diagnostic{}})
	return nil
}

// setDoc stores a document's text and publishes the diagnostics of every
// open document of its folder, which make one model together.
func (s *Server) setDoc(gc *glsp.Context, uri, text string) {
	path := uriPath(uri)
	s.mu.Lock()
	s.docs[path] = text
	s.mu.Unlock()
	w := s.workspace(path)
	for _, f := range w.paths {
		if _, open := s.openText(f); !open {
			continue
		}
		diags := []protocol.Diagnostic{}
		for _, d := range w.diags {
			if d.Pos.File == f {
				diags = append(diags, toDiagnostic(d, w.src[f]))
			}
		}
		gc.Notify(protocol.ServerTextDocumentPublishDiagnostics, protocol.PublishDiagnosticsParams{URI: pathURI(f), Diagnostics: diags})
	}
}

func (s *Server) openText(path string) (string, bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	t, ok := s.docs[path]
	return t, ok
}

// modelFiles lists the model files of path's folder: the .roll files on
// disk and the open documents there, sorted.
func (s *Server) modelFiles(path string) []string {
	dir := filepath.Dir(path)
	seen := map[string]bool{}
	names, _ := filepath.Glob(filepath.Join(dir, "*.roll"))
	s.mu.Lock()
	for p := range s.docs {
		if filepath.Dir(p) == dir {
			names = append(names, p)
		}
	}
	s.mu.Unlock()
	var out []string
	for _, n := range names {
		if !seen[n] {
			seen[n] = true
			out = append(out, n)
		}
	}
	sort.Strings(out)
	return out
}

// text is a file's text: the editor's if open, else the disk's.
func (s *Server) text(path string) (string, bool) {
	if t, ok := s.openText(path); ok {
		return t, true
	}
	b, err := os.ReadFile(path)
	return string(b), err == nil
}

func uriPath(uri string) string {
	u, err := url.Parse(uri)
	if err != nil || u.Scheme != "file" {
		return uri
	}
	return filepath.FromSlash(u.Path)
}

func pathURI(path string) string {
	if strings.Contains(path, "://") {
		return path
	}
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(path)}).String()
}
