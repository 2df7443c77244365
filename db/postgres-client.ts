// Knex's PostgreSQL client with the column types this project's migrations mean. The migrations were written for
// SQLite, where a string has no length limit and a float is 8 bytes; Knex's defaults on PostgreSQL would make them
// varchar(255) and 4-byte real. Here an unsized string is text and a float is double precision, so the same
// migrations give both databases the same meaning. Sized strings (`string('currency', 3)`) keep their size.
import pg from 'pg'
// @ts-expect-error -- Knex ships its dialects as CommonJS without declarations.
import ClientPg from 'knex/lib/dialects/postgres/index.js'
// @ts-expect-error -- as above.
import ColumnCompilerPg from 'knex/lib/dialects/postgres/schema/pg-columncompiler.js'

const ColumnCompilerBase = ColumnCompilerPg as new (client: unknown, tableCompiler: unknown, columnBuilder: unknown) => object

class ColumnCompiler extends ColumnCompilerBase {
  varchar(length?: number) {
    return length === undefined ? 'text' : `varchar(${length})`
  }

  floating() {
    return 'double precision'
  }
}

// Counts and sums arrive as int8 / numeric, which node-postgres hands over as strings (they may exceed 2^53).
// Every count and sum here is far below that, and SQLite hands them over as numbers; so do these.
pg.types.setTypeParser(pg.types.builtins.INT8, (value: string) => Number(value))
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (value: string) => Number(value))

export class PostgresClient extends ClientPg {
  columnCompiler(tableCompiler: unknown, columnBuilder: unknown) {
    return new ColumnCompiler(this, tableCompiler, columnBuilder)
  }
}
