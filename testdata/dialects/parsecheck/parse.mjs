// Parses every golden statement of the dialects whose engines have a
// grammar in dt-sql-parser (Spark SQL and Trino: the grammars the
// DTStack project keeps from the engines' own ANTLR grammars) and prints
// each syntax error as FILE:LINE:COL: message. Exit status 1 when there
// is one, 2 when a folder is missing. Run by TestGoldenSQLParses
// (cmd/rollwise/parsecheck_test.go):
//
//	node parse.mjs ../golden
import { readdirSync, readFileSync } from 'node:fs';
import { register } from 'node:module';
import { join } from 'node:path';

register('./hooks.mjs', import.meta.url);
const { SparkSQL, TrinoSQL } = await import('dt-sql-parser');

const grammars = { spark: new SparkSQL(), trino: new TrinoSQL() };
const root = process.argv[2] ?? '../golden';
let errors = 0;
for (const [dialect, parser] of Object.entries(grammars)) {
  const dir = join(root, dialect);
  let files;
  try {
    files = readdirSync(dir).filter((f) => f.endsWith('.sql')).sort();
  } catch (e) {
    console.error(`${dir}: ${e.message}`);
    process.exit(2);
  }
  let parsed = 0;
  for (const f of files) {
    const text = readFileSync(join(dir, f), 'utf8');
    // A refused case holds only comments: nothing to parse.
    if (text.split('\n').every((l) => l.trim() === '' || l.startsWith('--'))) {
      continue;
    }
    parsed++;
    for (const e of parser.validate(text)) {
      errors++;
      console.log(`${join(dir, f)}:${e.startLine}:${e.startColumn}: ${e.message}`);
    }
  }
  console.log(`${dialect}: ${parsed} files parsed with dt-sql-parser's ${parser.constructor.name} grammar`);
}
process.exit(errors > 0 ? 1 : 0);
