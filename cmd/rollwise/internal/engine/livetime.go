package engine

import (
	"context"
	"errors"
	"fmt"
	"strconv"
	"time"
)

// The bounds of a live session when LiveOptions leave them zero: a server
// that accepts and never answers, or a frozen one, must not hang a
// command until it is killed.
const (
	DefaultConnectTimeout   = 10 * time.Second
	DefaultStatementTimeout = 5 * time.Minute
)

// connectTimeout is how long connecting may take, setup included.
func (o LiveOptions) connectTimeout() time.Duration {
	if o.ConnectTimeout > 0 {
		return o.ConnectTimeout
	}
	return DefaultConnectTimeout
}

// statementTimeout is how long one statement may take (reading its rows
// included); 0 means no bound.
func (o LiveOptions) statementTimeout() time.Duration {
	switch {
	case o.StatementTimeout > 0:
		return o.StatementTimeout
	case o.StatementTimeout < 0:
		return 0
	}
	return DefaultStatementTimeout
}

// serverTimeout is the statement that makes the server itself stop a
// statement past the timeout, even when the client is gone: PostgreSQL's
// statement_timeout (milliseconds), MariaDB's max_statement_time
// (seconds), MySQL's max_execution_time (milliseconds, SELECT only).
// "" when there is no bound. server is postgres, mariadb or mysql. The
// server's bound is a second later than the client's, so that the client
// stops the statement first and can say why.
func serverTimeout(server string, d time.Duration) string {
	if d <= 0 {
		return ""
	}
	d += time.Second
	ms := strconv.FormatInt(max(1, d.Milliseconds()), 10)
	switch server {
	case "postgres":
		return "SET statement_timeout = " + ms
	case "mariadb":
		return "SET SESSION max_statement_time = " + strconv.FormatFloat(d.Seconds(), 'f', 3, 64)
	}
	return "SET SESSION max_execution_time = " + ms
}

// withStatementTimeout bounds ctx by the session's statement timeout.
func (l *Live) withStatementTimeout(ctx context.Context) (context.Context, context.CancelFunc) {
	if l.timeout <= 0 {
		return context.WithCancel(ctx)
	}
	return context.WithTimeout(ctx, l.timeout)
}

// explain says why a statement stopped when its context did: the timeout,
// or an interrupt; after either, the statement was cancelled on the
// server (PostgreSQL: pg_cancel_backend; MySQL/MariaDB: KILL QUERY;
// SQLite: sqlite3_interrupt). Other errors are returned as they are.
func (l *Live) explain(ctx context.Context, err error) error {
	if err == nil || ctx.Err() == nil {
		return err
	}
	l.cancelOnServer()
	if errors.Is(ctx.Err(), context.DeadlineExceeded) {
		return fmt.Errorf("the statement ran past the timeout of %v (--timeout) and was cancelled on the server: %w", l.timeout, err)
	}
	return fmt.Errorf("interrupted: the statement was cancelled on the server: %w", err)
}

// cancelOnServer stops the statement the session's connection runs,
// from a second connection: when a context ends, database/sql closes the
// connection, and the server would run the statement on (PostgreSQL
// until it next writes to the client, MySQL to its end). Best effort,
// bounded by the connect timeout; SQLite runs in this process and needs
// none.
func (l *Live) cancelOnServer() {
	if l.connID == 0 {
		return
	}
	stmt := "KILL QUERY " + strconv.FormatInt(l.connID, 10)
	if l.dialect == "postgres" {
		stmt = "SELECT pg_cancel_backend(" + strconv.FormatInt(l.connID, 10) + ")"
	}
	ctx, cancel := context.WithTimeout(context.Background(), l.connectTimeout)
	defer cancel()
	c, err := l.db.Conn(ctx)
	if err != nil {
		return
	}
	defer c.Close()
	c.ExecContext(ctx, stmt) //nolint:errcheck // best effort, see above
}
