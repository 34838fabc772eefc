#!/usr/bin/env python3
"""Builds tests/reference/store_v2.sqlite: a store as an older phdose left it, with only
migrations 0001-0002 applied (the schema_migrations table exactly as src/store/migrate.rs
creates it) and three rows of the user's own measured values. tests/store.rs opens a copy with
today's phdose and checks that the upgrade keeps those rows intact.

The `key` column holds what an older program could have stored (here: the SMILES itself); the
upgrade recomputes it. The pKa values are the user's (demo data of our own, not a source).

Run from the repository root:  python3 tests/reference/make_store_v2_fixture.py
"""
import os
import sqlite3

OUT = os.path.join("tests", "reference", "store_v2.sqlite")
USER_ROWS = [
    # smiles, kind, pka, note, added
    ("NCC(=O)O", "acid", 2.3456789012345, 'pH-metric, "run 2", 25 °C', "2025-03-14"),
    ("NCC(=O)O", "base", 9.78, 'pH-metric, "run 2", 25 °C', "2025-03-14"),
    ("CC(=O)[O-].[Na+]", "acid", 4.71, "notebook 7, p. 12", "2025-11-02"),
]


def main():
    if os.path.exists(OUT):
        os.remove(OUT)
    conn = sqlite3.connect(OUT)
    conn.executescript(
        """CREATE TABLE IF NOT EXISTS schema_migrations (
             version    INTEGER PRIMARY KEY,
             name       TEXT NOT NULL,
             applied_at TEXT NOT NULL DEFAULT (datetime('now'))
         );"""
    )
    for version, name in [(1, "groups"), (2, "measured")]:
        path = os.path.join("migrations", f"{version:04d}_{name}.sql")
        with open(path, encoding="utf-8") as f:
            conn.executescript(f.read())
        conn.execute(
            "INSERT INTO schema_migrations (version, name, applied_at) VALUES (?, ?, ?)",
            (version, name, "2025-01-01 00:00:00"),
        )
    conn.execute("INSERT INTO store_meta (key, value) VALUES ('data_version', '0.1.0-v2')")
    for smiles, kind, pka, note, added in USER_ROWS:
        conn.execute(
            "INSERT INTO user_measured (key, smiles, kind, pka, note, added) "
            "VALUES (?, ?, ?, ?, ?, ?)",
            (smiles, smiles, kind, pka, note, added),
        )
    conn.commit()
    conn.execute("VACUUM")
    conn.close()
    print(f"wrote {OUT} (sqlite {sqlite3.sqlite_version})")


if __name__ == "__main__":
    main()
