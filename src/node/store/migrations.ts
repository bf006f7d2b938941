// Numbered schema migrations. Each runs once, in order, inside one transaction; PRAGMA
// user_version records how far a database has come. Never edit a released step: add a new one.

export interface Migration {
  version: number;
  description: string;
  sql: string;
}

export const MIGRATIONS: Migration[] = [
  {
    version: 1,
    description: 'imports journal, lots, wafers with columnar die data, settings',
    sql: `
      CREATE TABLE imports (
        id INTEGER PRIMARY KEY,
        file_name TEXT NOT NULL,
        content_hash TEXT NOT NULL UNIQUE,
        bytes INTEGER NOT NULL,
        rows_stored INTEGER NOT NULL,
        rows_rejected INTEGER NOT NULL,
        imported_at TEXT NOT NULL,
        report TEXT NOT NULL
      );
      CREATE TABLE lots (
        id INTEGER PRIMARY KEY,
        name TEXT NOT NULL UNIQUE,
        created_at TEXT NOT NULL
      );
      CREATE TABLE wafers (
        id INTEGER PRIMARY KEY,
        lot_id INTEGER NOT NULL REFERENCES lots(id),
        name TEXT NOT NULL,
        import_id INTEGER NOT NULL REFERENCES imports(id),
        die_count INTEGER NOT NULL,
        x BLOB NOT NULL,
        y BLOB NOT NULL,
        site BLOB NOT NULL,
        UNIQUE (lot_id, name)
      );
      CREATE TABLE wafer_values (
        wafer_id INTEGER NOT NULL REFERENCES wafers(id) ON DELETE CASCADE,
        param TEXT NOT NULL,
        unit TEXT NOT NULL,
        position INTEGER NOT NULL,
        data BLOB NOT NULL,
        PRIMARY KEY (wafer_id, param)
      );
      CREATE TABLE settings (
        key TEXT PRIMARY KEY,
        value TEXT NOT NULL
      );
    `,
  },
  {
    version: 2,
    description: 'wafer geometry (STDF WCR), per-die bins (STDF PRR), and the files a merged wafer came from',
    sql: `
      CREATE TABLE wafer_geometry (
        wafer_id INTEGER PRIMARY KEY REFERENCES wafers(id) ON DELETE CASCADE,
        wafer_size REAL,
        die_height REAL,
        die_width REAL,
        units TEXT,
        flat TEXT,
        center_x INTEGER,
        center_y INTEGER,
        pos_x TEXT,
        pos_y TEXT
      );
      CREATE TABLE wafer_bins (
        wafer_id INTEGER PRIMARY KEY REFERENCES wafers(id) ON DELETE CASCADE,
        hard BLOB NOT NULL,
        soft BLOB NOT NULL
      );
      CREATE TABLE wafer_sources (
        wafer_id INTEGER NOT NULL REFERENCES wafers(id) ON DELETE CASCADE,
        import_id INTEGER NOT NULL REFERENCES imports(id),
        dies INTEGER NOT NULL,
        PRIMARY KEY (wafer_id, import_id)
      );
    `,
  },
];

export const SCHEMA_VERSION = MIGRATIONS[MIGRATIONS.length - 1].version;
